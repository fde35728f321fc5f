import type { NightlyRunOutcome, NightlyTrigger } from '#shared/schemas/enums.ts';
import type { NightlyRun } from '#shared/schemas/nightly.ts';
import type { Queryable } from './queryable.ts';

interface RunRow {
  id: number;
  started_at: Date;
  finished_at: Date | null;
  outcome: NightlyRunOutcome | null;
  trigger: NightlyTrigger;
  host: string;
  pid: number;
  inbox: string;
  report_date: string;
  files: NightlyRun['files'];
  steps: NightlyRun['steps'];
  figures: NightlyRun['figures'];
  mail: NightlyRun['mail'] | Record<string, never>;
  error: string | null;
}

const toRun = (r: RunRow): NightlyRun => ({
  id: r.id,
  startedAt: r.started_at.toISOString(),
  finishedAt: r.finished_at?.toISOString() ?? null,
  outcome: r.outcome,
  trigger: r.trigger,
  host: r.host,
  pid: r.pid,
  inbox: r.inbox,
  reportDate: r.report_date,
  files: r.files,
  steps: r.steps,
  figures: r.figures,
  mail: r.mail && 'queued' in r.mail ? (r.mail as NightlyRun['mail']) : null,
  error: r.error,
});

export async function insertNightlyRun(
  q: Queryable,
  v: { trigger: NightlyTrigger; host: string; pid: number; inbox: string; reportDate: string; outcome?: NightlyRunOutcome; error?: string },
): Promise<number> {
  const finished = v.outcome !== undefined;
  const { rows } = await q.query<{ id: number }>(
    `insert into nightly_runs (trigger, host, pid, inbox, report_date, outcome, error, finished_at)
     values ($1, $2, $3, $4, $5, $6, $7, case when $8 then now() end) returning id`,
    [v.trigger, v.host, v.pid, v.inbox, v.reportDate, v.outcome ?? null, v.error ?? null, finished],
  );
  return rows[0].id;
}

/** What a run has done so far: written after each file and step, so a run killed midway leaves its trace. */
export async function saveNightlyProgress(
  q: Queryable,
  id: number,
  v: { files: NightlyRun['files']; steps: NightlyRun['steps']; figures: NightlyRun['figures']; mail: NightlyRun['mail'] },
): Promise<void> {
  await q.query(`update nightly_runs set files = $2, steps = $3, figures = $4, mail = $5 where id = $1`, [
    id,
    JSON.stringify(v.files),
    JSON.stringify(v.steps),
    JSON.stringify(v.figures),
    JSON.stringify(v.mail ?? {}),
  ]);
}

export async function finishNightlyRun(q: Queryable, id: number, outcome: NightlyRunOutcome, error: string | null): Promise<void> {
  await q.query(`update nightly_runs set outcome = $2, error = $3, finished_at = now() where id = $1`, [id, outcome, error]);
}

/**
 * Runs that never finished (the process was killed or lost its database): marked failed. Called by the
 * run holding the nightly lock, so no run of these is still alive.
 */
export async function closeInterruptedRuns(q: Queryable): Promise<number> {
  const { rowCount } = await q.query(
    `update nightly_runs set outcome = 'failed', finished_at = now(),
       error = 'interrupted: the run stopped before the end (the next run finished its files)'
     where finished_at is null`,
  );
  return rowCount ?? 0;
}

export async function getNightlyRun(q: Queryable, id: number): Promise<NightlyRun | undefined> {
  const { rows } = await q.query<RunRow>(`select * from nightly_runs where id = $1`, [id]);
  return rows[0] && toRun(rows[0]);
}

export async function listNightlyRuns(q: Queryable, page: { limit: number; offset: number }): Promise<{ runs: NightlyRun[]; total: number }> {
  const [{ rows }, count] = await Promise.all([
    q.query<RunRow>(`select * from nightly_runs order by id desc limit $1 offset $2`, [page.limit, page.offset]),
    q.query<{ n: number }>(`select count(*)::int as n from nightly_runs`),
  ]);
  return { runs: rows.map(toRun), total: count.rows[0].n };
}

/**
 * The session holding an advisory lock (classid, objid) and when its connection started: the nightly run
 * opens a fresh connection for its lock, so that is when the run began.
 */
export async function advisoryLockHolder(q: Queryable, classId: number, objId: number): Promise<{ since: Date; application: string } | undefined> {
  const { rows } = await q.query<{ since: Date; application: string }>(
    `select a.backend_start as since, a.application_name as application
       from pg_locks l join pg_stat_activity a on a.pid = l.pid
      where l.locktype = 'advisory' and l.classid = $1 and l.objid = $2 and l.objsubid = 2 and l.granted
      limit 1`,
    [classId, objId],
  );
  return rows[0];
}
