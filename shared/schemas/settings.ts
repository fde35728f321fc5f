import { z } from 'zod';
import { confidenceLevelSchema, trimmedLineSchema } from './common.ts';

const settingFields = {
  currency: trimmedLineSchema.min(1).max(8),
  waterValuePerM3: z.number().nonnegative(),
  elementUnitCost: z.number().nonnegative(),
  crewHoursPerWeek: z.number().positive(),
  confidence: confidenceLevelSchema,
  tdsPerMicroSiemens: z.number().positive(),
  osmoticBarPerMgL: z.number().positive(),
  tcfUBelow25K: z.number().positive(),
  tcfUAbove25K: z.number().positive(),
  alertFlowDropPct: z.number().positive().max(100),
  alertDpRisePct: z.number().positive().max(500),
  alertSaltPassageRisePct: z.number().positive().max(500),
  baselineChangeOutSharePct: z.number().positive().max(100),
  baselineChangeOutDays: z.number().positive().max(365),
  digestRecipients: z.array(trimmedLineSchema.pipe(z.email())),
};

/** Plant-wide settings an admin can change; every key always has a value. */
export const settingsSchema = z.object(settingFields);
export type Settings = z.infer<typeof settingsSchema>;
export type SettingKey = keyof Settings;

/**
 * Defaults: docs/design.md §6 (normalization constants: common practice; alert levels: common practice,
 * flow −10 %, ΔP +15 %, salt passage +5 %; a performance baseline resets after a change-out of 20 % of
 * a stage's elements within 7 days, not after a single swap: common practice); costs are the demo
 * plant's invented figures.
 */
export const settingsDefaults: Settings = {
  currency: 'EUR',
  waterValuePerM3: 0.85,
  elementUnitCost: 620,
  crewHoursPerWeek: 160,
  confidence: 0.9,
  tdsPerMicroSiemens: 0.67,
  osmoticBarPerMgL: 0.000689475729,
  tcfUBelow25K: 3020,
  tcfUAbove25K: 2640,
  alertFlowDropPct: 10,
  alertDpRisePct: 15,
  alertSaltPassageRisePct: 5,
  baselineChangeOutSharePct: 20,
  baselineChangeOutDays: 7,
  digestRecipients: [],
};

/** PUT /api/settings: any subset of the keys, nothing filled in; unknown keys are refused. */
export const settingsUpdateBodySchema = z.object(settingFields).partial().strict();
export type SettingsUpdateBody = z.infer<typeof settingsUpdateBodySchema>;
