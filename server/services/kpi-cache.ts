import { promisify } from 'node:util';
import { gzip, gzipSync } from 'node:zlib';

const gzipAsync = promisify(gzip);

/** A KPI answer ready to send: its JSON and the gzip of it, made once. */
export interface CachedBody {
  json: Buffer;
  gzip: Buffer;
  /** How long computing and encoding the answer took, ms (for the Server-Timing header). */
  computeMs: number;
  encodeMs: number;
}

/** What `get` hands back: the body, and whether this request computed it or found it. */
export interface CacheAnswer {
  body: CachedBody;
  hit: boolean;
}

interface Entry {
  version: string;
  body: Promise<CachedBody>;
  /** The question, so it can be asked again when the data changes (kpi-warmer.ts). */
  name: string;
  query: object;
}

/**
 * KPI answers keyed by KPI, query and data version. The data only changes at an import, a refresh or
 * a settings change, so a dashboard read by many people computes, serializes and compresses each
 * answer once; concurrent identical requests share one computation. The cache is per process and
 * checks the version in the database on every request, so replicas behind a load balancer never
 * serve a stale answer (the caller reads the version: see routes/kpi.ts).
 *
 * Compression: the first answer is gzipped at level 1 (a 2 MB answer in ~8 ms rather than ~21 ms at
 * level 6), so the request that computed it is not kept waiting; level 6 (about a fifth smaller)
 * is then made in the background and replaces it for every later request.
 */
export class KpiCache {
  private entries = new Map<string, Entry>();
  constructor(private readonly maxEntries = 200) {}

  /** `version`: the data version read for this request (`dataVersionAndSettings`), so the caller can read it alongside other things. */
  async get(version: string, name: string, query: object, compute: () => Promise<unknown>): Promise<CacheAnswer> {
    const key = `${name}?${JSON.stringify(query)}`;
    const hit = this.entries.get(key);
    if (hit && hit.version === version) {
      // Refresh its place: the map's order is the eviction order.
      this.entries.delete(key);
      this.entries.set(key, hit);
      return { body: await hit.body, hit: true };
    }
    const started = performance.now();
    const body = compute().then(async (value) => {
      const computed = performance.now();
      const json = Buffer.from(JSON.stringify(value));
      // Up to 256 kB on the spot (level 1 takes ~2 ms there): a hop to the thread pool and back costs
      // more than that on a busy machine. Larger answers go to the pool.
      const fast = json.length <= 256 * 1024 ? gzipSync(json, { level: 1 }) : await gzipAsync(json, { level: 1 });
      return { json, gzip: fast, computeMs: computed - started, encodeMs: performance.now() - computed };
    });
    const entry: Entry = { version, body, name, query };
    this.entries.set(key, entry);
    body.then(
      (first) => void this.recompress(key, entry, first),
      () => this.entries.get(key) === entry && this.entries.delete(key),
    );
    while (this.entries.size > this.maxEntries) this.entries.delete(this.entries.keys().next().value!);
    return { body: await body, hit: false };
  }

  /**
   * The questions last answered under a version other than `version`, most recently asked first, at
   * most `limit`.
   */
  staleQuestions(version: string, limit: number): Array<{ name: string; query: object }> {
    return [...this.entries.values()]
      .reverse()
      .filter((e) => e.version !== version)
      .slice(0, limit)
      .map(({ name, query }) => ({ name, query }));
  }

  /** Swap in the level-6 gzip of an answer, if the entry is still the one cached. */
  private async recompress(key: string, entry: Entry, first: CachedBody): Promise<void> {
    const smaller = await gzipAsync(first.json, { level: 6 });
    if (this.entries.get(key) === entry) entry.body = Promise.resolve({ ...first, gzip: smaller });
  }
}
