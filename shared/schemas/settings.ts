import { z } from 'zod';

/**
 * Plant-wide settings an admin can change. Defaults are DESIGN.md §6's (normalization constants:
 * common practice; alert levels: common practice, flow −10 %, ΔP +15 %, salt passage +5 %).
 */
export const settingsSchema = z.object({
  currency: z.string().trim().min(1).max(8).default('EUR'),
  waterValuePerM3: z.number().nonnegative().default(0.85),
  elementUnitCost: z.number().nonnegative().default(620),
  crewHoursPerWeek: z.number().positive().default(160),
  confidence: z.number().gt(0.5).lt(1).default(0.9),
  tdsPerMicroSiemens: z.number().positive().default(0.67),
  osmoticBarPerMgL: z.number().positive().default(0.000689475729),
  tcfUBelow25K: z.number().positive().default(3020),
  tcfUAbove25K: z.number().positive().default(2640),
  alertFlowDropPct: z.number().positive().max(100).default(10),
  alertDpRisePct: z.number().positive().max(500).default(15),
  alertSaltPassageRisePct: z.number().positive().max(500).default(5),
  digestRecipients: z.array(z.email()).default([]),
});
export type Settings = z.infer<typeof settingsSchema>;
export type SettingKey = keyof Settings;

export const settingsDefaults: Settings = settingsSchema.parse({});

/** PUT /api/settings: any subset of the keys; unknown keys are refused. */
export const settingsUpdateBodySchema = settingsSchema.partial().strict();
export type SettingsUpdateBody = z.infer<typeof settingsUpdateBodySchema>;
