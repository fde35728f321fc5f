// The registers of the maintenance system: assets, tag map, work orders, element installs and job
// steps. They are small next to the historian (thousands of rows), so each file is read whole,
// every row validated with its zod row schema and checked against the file and the database, and
// only the rows that differ from what is stored are written.
import type { z } from 'zod';
import { assetKinds, censoringReasons, type AssetKind } from '#shared/schemas/enums.ts';
import {
  assetRowSchema,
  elementRowSchema,
  jobStepRowSchema,
  tagRowSchema,
  workOrderRowSchema,
} from '#shared/schemas/import-rows.ts';
import { importColumns } from '#shared/schemas/imports.ts';
import { unitFor } from '#shared/units.ts';
import { listAssets, setParents, upsertAssets, type AssetRecord } from '../db/queries/assets.ts';
import { markTagsDirty } from '../db/queries/derived.ts';
import { listElementValues, upsertElements, type ElementValues } from '../db/queries/elements.ts';
import { listJobStepValues, rebuildJobSpans, upsertJobSteps, type JobStepValues } from '../db/queries/job-steps.ts';
import { listTags, upsertTags } from '../db/queries/tags.ts';
import { listWorkOrderValues, upsertWorkOrders, type WorkOrderValues } from '../db/queries/work-orders.ts';
import { columnIndex, rowObject, type KindContext, type KindResult } from './context.ts';
import { maxFieldLength } from './source.ts';
import { readBoolean } from './values.ts';

type Kind = Exclude<keyof typeof importColumns, 'historian'>;

interface ValidRow<T> {
  line: number;
  row: T;
  cells: string[];
}

const numberColumns = new Set(['rated_permeate_m3h', 'element_capacity', 'rack_row', 'rack_col', 'labour_hours', 'labour_cost', 'parts_cost', 'position', 'step']);
const formulaStart = /^[=+\-@]/;

/** Read every row, check its shape and its schema; the rest of the checks are the kind's own. */
async function readRows<S extends z.ZodType>(ctx: KindContext, kind: Kind, schema: S): Promise<{ rows: ValidRow<z.infer<S>>[]; read: number }> {
  const index = columnIndex(ctx.columns, importColumns[kind]);
  const rows: ValidRow<z.infer<S>>[] = [];
  let read = 0;
  let formulaLike = 0;
  for await (const batch of ctx.source.batches) {
    for (const { line, cells } of batch) {
      read++;
      if (cells.length !== ctx.columns.length) {
        ctx.rejects.add(line, `expected ${ctx.columns.length} columns, found ${cells.length}`, cells);
        continue;
      }
      if (cells.some((c) => c.length > maxFieldLength)) {
        ctx.rejects.add(line, `a field is longer than ${maxFieldLength} characters (unterminated quote?)`, cells);
        continue;
      }
      const obj = rowObject(cells, index) as Record<string, string>;
      for (const key of Object.keys(obj)) {
        if (ctx.decimalComma && numberColumns.has(key)) obj[key] = obj[key].replace(',', '.');
        else if (formulaStart.test(obj[key]) && !numberColumns.has(key) && Number.isNaN(Number(obj[key]))) formulaLike++;
      }
      const parsed = schema.safeParse(obj);
      if (!parsed.success) {
        ctx.rejects.add(line, parsed.error.issues.map((i) => (i.path.length ? `${String(i.path[0])}: ${i.message}` : i.message)).join('; '), cells);
        continue;
      }
      rows.push({ line, row: parsed.data, cells });
    }
    ctx.progress(read);
  }
  // Text that looks like a spreadsheet formula is kept as text; exports write it as a string cell.
  if (formulaLike) ctx.notes.formulaLikeText = formulaLike;
  return { rows, read };
}

/** Keep the first row of each natural key; later ones are rejected with the line of the first. */
function firstOfEachKey<T>(ctx: KindContext, rows: ValidRow<T>[], key: (r: T) => string, label: string): ValidRow<T>[] {
  const seen = new Map<string, number>();
  return rows.filter((r) => {
    const k = key(r.row);
    const first = seen.get(k);
    if (first !== undefined) {
      ctx.rejects.add(r.line, `${label} ${k} appears again (first at line ${first})`, r.cells);
      return false;
    }
    seen.set(k, r.line);
    return true;
  });
}

const same = (a: unknown, b: unknown): boolean =>
  a instanceof Date || b instanceof Date ? (a as Date | null)?.getTime() === (b as Date | null)?.getTime() : a === b;

function differs<T extends object>(a: T, b: T): boolean {
  return (Object.keys(a) as (keyof T)[]).some((k) => !same(a[k], b[k]));
}

/** A timestamp cell in the site's zone, or a reject reason. Empty gives null when allowed. */
function instant(ctx: KindContext, text: string, label: string): Date | null | string {
  if (text === '') return null;
  const r = ctx.time.read(text);
  return r.ok ? new Date(r.value) : `${label}: ${r.reason}`;
}

/** Count new, changed and unchanged rows against what is stored, by natural key. */
function classify<T extends object>(incoming: { key: string; values: T }[], stored: Map<string, T>) {
  const changed: T[] = [];
  let inserted = 0;
  let updated = 0;
  let unchanged = 0;
  for (const { key, values } of incoming) {
    const old = stored.get(key);
    if (!old) inserted++;
    else if (differs(values, old)) updated++;
    else {
      unchanged++;
      continue;
    }
    changed.push(values);
  }
  return { changed, inserted, updated, unchanged };
}

export async function importAssets(ctx: KindContext): Promise<KindResult> {
  const { rows, read } = await readRows(ctx, 'assets', assetRowSchema);
  const unique = firstOfEachKey(ctx, rows, (r) => r.code, 'asset code');
  const existing = await listAssets(ctx.client, ctx.site.id);
  const known = new Map<string, AssetKind>(existing.map((a) => [a.code, a.kind]));
  for (const r of unique) known.set(r.row.code, r.row.kind as AssetKind);

  const accepted = unique.filter((r) => {
    const { row } = r;
    let reason: string | undefined;
    if (row.parent === row.code) reason = 'an asset cannot be its own parent';
    else if (row.parent && !known.has(row.parent)) reason = `parent "${row.parent}" is not in this file nor on site ${ctx.site.code}`;
    else if (row.kind === 'vessel' && row.element_capacity === null) reason = 'a vessel needs an element_capacity';
    else if (row.kind !== 'vessel' && row.element_capacity !== null) reason = `element_capacity is for vessels, not ${row.kind}`;
    if (reason) ctx.rejects.add(r.line, reason, r.cells);
    return !reason;
  });

  // Parent links must form a tree: reject rows whose parent chain comes back to them.
  const parentOf = new Map<string, string | null>(existing.map((a) => [a.code, a.parentCode]));
  for (const r of accepted) parentOf.set(r.row.code, r.row.parent || null);
  const inCycle = new Set<string>();
  for (const r of accepted) {
    const seen = new Set<string>();
    let at: string | null | undefined = r.row.code;
    while (at && !seen.has(at)) {
      seen.add(at);
      at = parentOf.get(at);
    }
    if (at === r.row.code) inCycle.add(r.row.code);
  }
  const tree = accepted.filter((r) => {
    if (inCycle.has(r.row.code)) ctx.rejects.add(r.line, `parent links of ${r.row.code} form a cycle`, r.cells);
    return !inCycle.has(r.row.code);
  });

  const stored = new Map(
    existing.map((a) => [
      a.code,
      { code: a.code, name: a.name, kind: a.kind, parent: a.parentCode, ratedPermeateM3h: a.ratedPermeateM3h, elementCapacity: a.elementCapacity, rackRow: a.rackRow, rackCol: a.rackCol },
    ]),
  );
  const incoming = tree.map(({ row }) => ({
    key: row.code,
    values: {
      code: row.code,
      name: row.name,
      kind: row.kind as AssetKind,
      parent: row.parent || null,
      ratedPermeateM3h: row.rated_permeate_m3h,
      elementCapacity: row.element_capacity,
      rackRow: row.rack_row,
      rackCol: row.rack_col,
    },
  }));
  const { changed, inserted, updated, unchanged } = classify(incoming, stored);
  await upsertAssets(ctx.client, ctx.site.id, changed);
  await setParents(ctx.client, ctx.site.id, changed.map((c) => ({ code: c.code, parent: c.parent })));
  ctx.notes.kinds = Object.fromEntries(assetKinds.map((k) => [k, tree.filter((r) => r.row.kind === k).length]).filter(([, n]) => n));
  return { rowsRead: read, rowsInserted: inserted, rowsUpdated: updated, rowsUnchanged: unchanged };
}

async function assetsByCode(ctx: KindContext): Promise<Map<string, AssetRecord>> {
  return new Map((await listAssets(ctx.client, ctx.site.id)).map((a) => [a.code.toLowerCase(), a]));
}

export async function importTags(ctx: KindContext): Promise<KindResult> {
  const { rows, read } = await readRows(ctx, 'tags', tagRowSchema);
  const unique = firstOfEachKey(ctx, rows, (r) => r.tag.toLowerCase(), 'tag');
  const assets = await assetsByCode(ctx);
  const incoming: { key: string; values: { name: string; assetId: number; quantity: (typeof rows)[number]['row']['quantity']; sourceUnit: string } }[] = [];
  for (const r of unique) {
    const asset = assets.get(r.row.asset.toLowerCase());
    if (!asset) {
      ctx.rejects.add(r.line, `unknown asset "${r.row.asset}" on site ${ctx.site.code}`, r.cells);
      continue;
    }
    const unit = unitFor(r.row.quantity as never, r.row.unit);
    if (!unit.ok) {
      ctx.rejects.add(r.line, unit.reason, r.cells);
      continue;
    }
    incoming.push({ key: r.row.tag.toLowerCase(), values: { name: r.row.tag, assetId: asset.id, quantity: r.row.quantity, sourceUnit: r.row.unit } });
  }
  const stored = new Map(
    (await listTags(ctx.client, ctx.site.id)).map((t) => [t.name.toLowerCase(), { name: t.name, assetId: t.assetId, quantity: t.quantity as string, sourceUnit: t.sourceUnit }]),
  );
  const { changed, inserted, updated, unchanged } = classify(incoming, stored);
  await upsertTags(ctx.client, ctx.site.id, changed as never);
  // A tag that moved to another asset or changed quantity: what refresh derived from it is rebuilt.
  const remapped = new Set(
    (changed as { name: string; assetId: number; quantity: string }[])
      .filter((c) => {
        const before = stored.get(c.name.toLowerCase());
        return before !== undefined && (before.assetId !== c.assetId || before.quantity !== c.quantity);
      })
      .map((c) => c.name.toLowerCase()),
  );
  if (remapped.size > 0) {
    const ids = (await listTags(ctx.client, ctx.site.id)).filter((t) => remapped.has(t.name.toLowerCase())).map((t) => t.id);
    await markTagsDirty(ctx.client, ids);
  }
  return { rowsRead: read, rowsInserted: inserted, rowsUpdated: updated, rowsUnchanged: unchanged };
}

export async function importWorkOrders(ctx: KindContext): Promise<KindResult> {
  const { rows, read } = await readRows(ctx, 'work-orders', workOrderRowSchema);
  const unique = firstOfEachKey(ctx, rows, (r) => r.wo_number, 'work order');
  const assets = await assetsByCode(ctx);
  const incoming: { key: string; values: WorkOrderValues }[] = [];
  for (const r of unique) {
    const { row } = r;
    const asset = assets.get(row.asset.toLowerCase());
    const times = {
      reported: instant(ctx, row.reported_at, 'reported_at'),
      started: instant(ctx, row.started_at, 'started_at'),
      completed: instant(ctx, row.completed_at, 'completed_at'),
      oosFrom: instant(ctx, row.out_of_service_from, 'out_of_service_from'),
      oosTo: instant(ctx, row.out_of_service_to, 'out_of_service_to'),
    };
    const bad = Object.values(times).filter((t): t is string => typeof t === 'string');
    const t = times as Record<keyof typeof times, Date | null>;
    let reason: string | undefined;
    if (!asset) reason = `unknown asset "${row.asset}" on site ${ctx.site.code}`;
    else if (bad.length) reason = bad.join('; ');
    else if (t.started && t.reported && t.started < t.reported) reason = 'started_at is before reported_at';
    else if (t.completed && !t.started) reason = 'completed_at is given without started_at';
    else if (t.completed && t.started && t.completed < t.started) reason = 'completed_at is before started_at (negative duration)';
    else if ((t.oosFrom === null) !== (t.oosTo === null)) reason = 'out_of_service_from and out_of_service_to go together';
    else if (t.oosFrom && t.oosTo && t.oosTo < t.oosFrom) reason = 'out_of_service_to is before out_of_service_from (negative duration)';
    else if (row.status === 'closed' && !t.completed) reason = 'a closed work order needs completed_at';
    if (reason) {
      ctx.rejects.add(r.line, reason, r.cells);
      continue;
    }
    incoming.push({
      key: row.wo_number,
      values: {
        woNumber: row.wo_number,
        assetId: asset!.id,
        type: row.type,
        priority: row.priority,
        status: row.status,
        failureCode: row.failure_code ? row.failure_code.toUpperCase() : null,
        description: row.description,
        reportedAt: t.reported!,
        startedAt: t.started,
        completedAt: t.completed,
        outOfServiceFrom: t.oosFrom,
        outOfServiceTo: t.oosTo,
        labourHours: row.labour_hours ?? 0,
        labourCost: row.labour_cost ?? 0,
        partsCost: row.parts_cost ?? 0,
        crew: row.crew || null,
      },
    });
  }
  const stored = new Map((await listWorkOrderValues(ctx.client, ctx.site.id)).map(({ id: _id, ...v }) => [v.woNumber, v]));
  const { changed, inserted, updated, unchanged } = classify(incoming, stored);
  await upsertWorkOrders(ctx.client, ctx.site.id, ctx.importId, changed);
  return { rowsRead: read, rowsInserted: inserted, rowsUpdated: updated, rowsUnchanged: unchanged };
}

export async function importElements(ctx: KindContext): Promise<KindResult> {
  const { rows, read } = await readRows(ctx, 'elements', elementRowSchema);
  const assets = await assetsByCode(ctx);
  const vessels = new Map([...assets.values()].map((a) => [a.id, a]));
  const incoming: { key: string; line: number; cells: string[]; values: ElementValues }[] = [];
  for (const r of rows) {
    const { row } = r;
    const vessel = assets.get(row.vessel.toLowerCase());
    const installed = instant(ctx, row.installed_at, 'installed_at');
    const removed = instant(ctx, row.removed_at, 'removed_at');
    let reason: string | undefined;
    if (!vessel) reason = `unknown vessel "${row.vessel}" on site ${ctx.site.code}`;
    else if (vessel.kind !== 'vessel') reason = `asset ${vessel.code} is a ${vessel.kind}, not a pressure vessel`;
    else if (row.position! > (vessel.elementCapacity ?? 0)) reason = `position ${row.position} is beyond vessel ${vessel.code}'s capacity of ${vessel.elementCapacity} elements`;
    else if (typeof installed === 'string') reason = installed;
    else if (typeof removed === 'string') reason = removed;
    else if (removed && installed && removed <= installed) reason = 'removed_at is not after installed_at (removal before install)';
    else if (!removed && row.removal_reason && !(censoringReasons as readonly string[]).includes(row.removal_reason)) {
      reason = `removal_reason "${row.removal_reason}" is given but removed_at is empty`;
    }
    if (reason) {
      ctx.rejects.add(r.line, reason, r.cells);
      continue;
    }
    const values: ElementValues = {
      serial: row.serial,
      model: row.model,
      vesselId: vessel!.id,
      position: row.position!,
      installedAt: installed as Date,
      removedAt: removed as Date | null,
      removalReason: removed ? row.removal_reason || null : null,
    };
    incoming.push({ key: `${row.serial}@${values.installedAt.toISOString()}`, line: r.line, cells: r.cells, values });
  }
  const unique = firstOfEachKey(
    ctx,
    incoming.map((i) => ({ line: i.line, cells: i.cells, row: i })),
    (i) => i.key,
    'element install',
  ).map((r) => r.row);

  // Two elements in one position at once: check each position's installs, stored and incoming.
  const storedRows = await listElementValues(ctx.client, ctx.site.id);
  const stored = new Map(storedRows.map(({ id: _id, ...v }) => [`${v.serial}@${v.installedAt.toISOString()}`, v]));
  const byPosition = new Map<string, { key: string; from: number; to: number; line?: number }[]>();
  const slot = (v: ElementValues) => `${v.vesselId}#${v.position}`;
  const incomingKeys = new Set(unique.map((u) => u.key));
  for (const [key, v] of stored) {
    if (incomingKeys.has(key)) continue;
    (byPosition.get(slot(v)) ?? byPosition.set(slot(v), []).get(slot(v))!).push({ key, from: v.installedAt.getTime(), to: v.removedAt?.getTime() ?? Infinity });
  }
  const accepted = unique.filter((u) => {
    const list = byPosition.get(slot(u.values)) ?? byPosition.set(slot(u.values), []).get(slot(u.values))!;
    const from = u.values.installedAt.getTime();
    const to = u.values.removedAt?.getTime() ?? Infinity;
    const clash = list.find((o) => from < o.to && o.from < to);
    if (clash) {
      const vessel = vessels.get(u.values.vesselId)!;
      const where = clash.line ? `line ${clash.line}` : 'the stored register';
      ctx.rejects.add(u.line, `position ${u.values.position} of vessel ${vessel.code} already holds element ${clash.key.split('@')[0]} then (${where})`, u.cells);
      return false;
    }
    list.push({ key: u.key, from, to, line: u.line });
    return true;
  });
  const { changed, inserted, updated, unchanged } = classify(accepted, stored);
  await upsertElements(ctx.client, ctx.site.id, ctx.importId, changed);
  return { rowsRead: read, rowsInserted: inserted, rowsUpdated: updated, rowsUnchanged: unchanged };
}

export async function importJobSteps(ctx: KindContext): Promise<KindResult> {
  const { rows, read } = await readRows(ctx, 'job-steps', jobStepRowSchema);
  const unique = firstOfEachKey(ctx, rows, (r) => `${r.wo_number} step ${r.step}`, 'job step');
  const orders = new Map((await listWorkOrderValues(ctx.client, ctx.site.id)).map((w) => [w.woNumber, w.id]));
  const incoming: { key: string; values: JobStepValues }[] = [];
  for (const r of unique) {
    const { row } = r;
    const workOrderId = orders.get(row.wo_number);
    const started = instant(ctx, row.started_at, 'started_at');
    const completed = instant(ctx, row.completed_at, 'completed_at');
    const guided = row.guided === '' ? { ok: true as const, value: false } : readBoolean(row.guided);
    let reason: string | undefined;
    if (workOrderId === undefined) reason = `unknown work order "${row.wo_number}" (import the work orders first)`;
    else if (typeof started === 'string') reason = started;
    else if (typeof completed === 'string') reason = completed;
    else if (!guided.ok) reason = `guided: ${guided.reason}`;
    else if (completed!.getTime() <= started!.getTime()) reason = `completed_at is not after started_at (${completed!.getTime() === started!.getTime() ? 'zero' : 'negative'} duration)`;
    if (reason) {
      ctx.rejects.add(r.line, reason, r.cells);
      continue;
    }
    incoming.push({
      key: `${workOrderId}#${row.step}`,
      values: {
        workOrderId: workOrderId!,
        step: row.step!,
        name: row.name,
        startedAt: started as Date,
        completedAt: completed as Date,
        guided: (guided as { value: boolean }).value,
        technician: row.technician || null,
      },
    });
  }
  const stored = new Map((await listJobStepValues(ctx.client, ctx.site.id)).map((v) => [`${v.workOrderId}#${v.step}`, v]));
  const { changed, inserted, updated, unchanged } = classify(incoming, stored);
  await upsertJobSteps(ctx.client, ctx.importId, changed);
  await rebuildJobSpans(ctx.client, [...new Set(changed.map((c) => c.workOrderId))]);
  return { rowsRead: read, rowsInserted: inserted, rowsUpdated: updated, rowsUnchanged: unchanged };
}
