import type { NightlyRunList } from '#shared/schemas/nightly.ts';
import type { PagingQuery } from '#shared/schemas/common.ts';
import type { Db } from '../db/client.ts';
import { listNightlyRuns } from '../db/queries/nightly-runs.ts';

/** A page of the nightly runs, newest first (GET /api/nightly-runs). */
export async function nightlyRunPage(db: Db, page: PagingQuery): Promise<NightlyRunList> {
  const { runs, total } = await listNightlyRuns(db.$client, page);
  return { runs, total, ...page };
}
