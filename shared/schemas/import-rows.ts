// zod schemas of one register row (after trimming), shared by the importers and their tests.
// Timestamps stay strings here: the importer reads them in the site's time zone.
import { z } from 'zod';
import { multiLineTextSchema } from './common.ts';
import { assetKinds, quantities, removalReasons, workOrderPriorities, workOrderStatuses, workOrderTypes } from './enums.ts';

// A NUL byte cannot be stored in a text column; register cells may be quoted multi-line text, so
// tabs and line breaks stay allowed and the row is rejected (with its line) for any other control.
const text = (max: number) => multiLineTextSchema.max(max, `longer than ${max} characters`);
const required = (label: string, max = 200) => text(max).min(1, `${label} is empty`);
const lower = (values: readonly string[], label: string) =>
  z
    .string()
    .transform((s) => s.trim().toLowerCase().replace(/[\s-]+/g, '_'))
    .pipe(z.enum(values as [string, ...string[]], { message: `unknown ${label} (expected ${values.join(', ')})` }));

/** A number cell: '' is absent; with decimal comma handled by the importer before parsing. */
const optionalNumber = (label: string, opts: { int?: boolean; min?: number } = {}) =>
  z
    .string()
    .transform((s, ctx) => {
      if (s === '') return null;
      const n = Number(s);
      if (!/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(s) || !Number.isFinite(n)) {
        ctx.addIssue({ code: 'custom', message: `${label} "${s}" is not a number` });
        return z.NEVER;
      }
      if (opts.int && !Number.isInteger(n)) {
        ctx.addIssue({ code: 'custom', message: `${label} "${s}" is not a whole number` });
        return z.NEVER;
      }
      if (opts.min !== undefined && n < opts.min) {
        ctx.addIssue({ code: 'custom', message: `${label} ${s} is below ${opts.min}` });
        return z.NEVER;
      }
      return n;
    });

export const assetRowSchema = z.object({
  code: required('code', 40).regex(/^[A-Za-z0-9][A-Za-z0-9._\-/]*$/, 'code may hold letters, digits and . _ - / only'),
  name: required('name'),
  kind: lower(assetKinds, 'asset kind'),
  parent: text(40),
  rated_permeate_m3h: optionalNumber('rated_permeate_m3h', { min: 0 }),
  element_capacity: optionalNumber('element_capacity', { int: true, min: 1 }),
  rack_row: optionalNumber('rack_row', { int: true, min: 1 }),
  rack_col: optionalNumber('rack_col', { int: true, min: 1 }),
});
export type AssetRow = z.infer<typeof assetRowSchema>;

export const tagRowSchema = z.object({
  tag: required('tag', 120),
  asset: required('asset', 40),
  quantity: lower(quantities, 'quantity'),
  unit: text(20),
});
export type TagRow = z.infer<typeof tagRowSchema>;

export const workOrderRowSchema = z.object({
  wo_number: required('wo_number', 60),
  asset: required('asset', 40),
  type: lower(workOrderTypes, 'work-order type'),
  priority: z.string().transform((s) => (s === '' ? 'medium' : s)).pipe(lower(workOrderPriorities, 'priority')),
  status: lower(workOrderStatuses, 'status'),
  failure_code: text(60),
  description: text(4000),
  reported_at: required('reported_at', 40),
  started_at: text(40),
  completed_at: text(40),
  out_of_service_from: text(40),
  out_of_service_to: text(40),
  labour_hours: optionalNumber('labour_hours', { min: 0 }),
  labour_cost: optionalNumber('labour_cost', { min: 0 }),
  parts_cost: optionalNumber('parts_cost', { min: 0 }),
  crew: text(120),
});
export type WorkOrderRow = z.infer<typeof workOrderRowSchema>;

const removalReason = z
  .string()
  .transform((s) => s.trim().toLowerCase())
  .pipe(
    z.union([z.enum(removalReasons), z.literal('in service').transform(() => ''), z.literal('')], {
      message: `unknown removal_reason (expected ${removalReasons.join(', ')}, in service or empty)`,
    }),
  );

export const elementRowSchema = z.object({
  serial: required('serial', 80),
  model: required('model', 80),
  vessel: required('vessel', 40),
  position: optionalNumber('position', { int: true, min: 1 }).refine((v) => v !== null, 'position is empty'),
  installed_at: required('installed_at', 40),
  removed_at: text(40),
  removal_reason: removalReason,
});
export type ElementRow = z.infer<typeof elementRowSchema>;

export const jobStepRowSchema = z.object({
  wo_number: required('wo_number', 60),
  step: optionalNumber('step', { int: true, min: 1 }).refine((v) => v !== null, 'step is empty'),
  name: required('name', 300),
  started_at: required('started_at', 40),
  completed_at: required('completed_at', 40),
  guided: text(10),
  technician: text(120),
});
export type JobStepRow = z.infer<typeof jobStepRowSchema>;
