import type { Db } from '../db/client.ts';
import { dataVersionAndSettings } from '../db/queries/data-version.ts';
import type { KpiCache } from './kpi-cache.ts';
import { kpiCatalog } from './kpi-catalog.ts';
import { settingsOf } from './settings.ts';

/** At most this many questions are recomputed after a change, the most recently asked first. */
export const warmQuestionLimit = 20;

/**
 * Keeps the answers people read ready: every `intervalMs` it reads the data version, and once a new
 * version has held for two checks in a row (so a nightly import and the refresh after it count as one
 * change, not two) it recomputes, one after another, the questions asked under an older version —
 * the dashboard's and the pages' own queries, whatever their parameters — so the first reader after
 * the night's import finds them cached instead of waiting seconds for each. Errors are left for the
 * next check; a request computes whatever is still missing.
 */
export class KpiWarmer {
  private timer: NodeJS.Timeout | null = null;
  private running: Promise<void> | null = null;
  private seen: string | null = null;
  private warmed: string | null = null;
  private stopped = false;

  constructor(
    private readonly db: Db,
    private readonly cache: KpiCache,
  ) {}

  start(intervalMs: number): this {
    this.timer = setInterval(() => void this.check(), intervalMs);
    // A timer of its own must not keep the process alive.
    this.timer.unref();
    return this;
  }

  stop(): void {
    this.stopped = true;
    if (this.timer) clearInterval(this.timer);
  }

  /** One check (what the timer runs); resolves when any warming it started is done. */
  check(): Promise<void> {
    this.running ??= this.checkOnce().finally(() => (this.running = null));
    return this.running;
  }

  private async checkOnce(): Promise<void> {
    try {
      const { version, stored } = await dataVersionAndSettings(this.db.$client);
      const settled = version === this.seen;
      this.seen = version;
      if (!settled || version === this.warmed) return;
      for (const { name, query } of this.cache.staleQuestions(version, warmQuestionLimit)) {
        if (this.stopped) return;
        const kpi = kpiCatalog.find((k) => k.name === name);
        if (!kpi) continue;
        const question = kpi.ask({ ...query }, settingsOf(stored));
        await this.cache.get(version, name, question.query, () => question.answer(this.db));
      }
      this.warmed = version;
    } catch {
      // The database went away or a computation failed: the next check tries again.
    }
  }
}
