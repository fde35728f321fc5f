import { promisify } from 'node:util';
import { gzip } from 'node:zlib';

const gzipAsync = promisify(gzip);

/** A KPI answer ready to send: its JSON and the gzip of it, made once. */
export interface CachedBody {
  json: Buffer;
  gzip: Buffer;
}

interface Entry {
  version: string;
  body: Promise<CachedBody>;
}

/**
 * KPI answers keyed by KPI, query and data version. The data only changes at an import, a refresh or
 * a settings change, so a dashboard read by many people computes, serializes and compresses each
 * answer once; concurrent identical requests share one computation. The cache is per process and
 * checks the version in the database on every request, so replicas behind a load balancer never
 * serve a stale answer (the caller reads the version: see routes/kpi.ts).
 */
export class KpiCache {
  private entries = new Map<string, Entry>();
  constructor(private readonly maxEntries = 200) {}

  /** `version`: the data version read for this request (`dataVersion`), so the caller can read it alongside other things. */
  async get(version: string, name: string, query: object, compute: () => Promise<unknown>): Promise<CachedBody> {
    const key = `${name}?${JSON.stringify(query)}`;
    const hit = this.entries.get(key);
    if (hit && hit.version === version) {
      // Refresh its place: the map's order is the eviction order.
      this.entries.delete(key);
      this.entries.set(key, hit);
      return hit.body;
    }
    const body = compute().then(async (value) => {
      const json = Buffer.from(JSON.stringify(value));
      // Level 1: a fifth of level 6's time on a 200 kB answer, for about 10 % more bytes.
      return { json, gzip: await gzipAsync(json, { level: 1 }) };
    });
    this.entries.set(key, { version, body });
    body.catch(() => this.entries.delete(key));
    while (this.entries.size > this.maxEntries) this.entries.delete(this.entries.keys().next().value!);
    return body;
  }
}
