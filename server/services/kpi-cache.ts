import type { Db } from '../db/client.ts';
import { dataVersion } from '../db/queries/data-version.ts';

interface Entry {
  version: string;
  value: Promise<unknown>;
}

/**
 * KPI answers keyed by KPI, query and data version. The data only changes at an import, a refresh or
 * a settings change, so a dashboard read by many people computes each answer once; concurrent
 * identical requests share one computation. The cache is per process and checks the version in the
 * database on every request, so replicas behind a load balancer never serve a stale answer.
 */
export class KpiCache {
  private entries = new Map<string, Entry>();
  constructor(private readonly maxEntries = 200) {}

  async get<T>(db: Db, name: string, query: object, compute: () => Promise<T>): Promise<T> {
    const version = await dataVersion(db.$client);
    const key = `${name}?${JSON.stringify(query)}`;
    const hit = this.entries.get(key);
    if (hit && hit.version === version) {
      // Refresh its place: the map's order is the eviction order.
      this.entries.delete(key);
      this.entries.set(key, hit);
      return hit.value as Promise<T>;
    }
    const value = compute();
    this.entries.set(key, { version, value });
    value.catch(() => this.entries.delete(key));
    while (this.entries.size > this.maxEntries) this.entries.delete(this.entries.keys().next().value!);
    return value;
  }
}
