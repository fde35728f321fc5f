import { z } from 'zod';

export const healthSchema = z.object({
  status: z.enum(['ok', 'degraded']),
  version: z.string(),
  uptimeSeconds: z.number(),
  database: z.object({
    up: z.boolean(),
    latencyMs: z.number().nullable(),
    error: z.string().optional(),
  }),
});
export type Health = z.infer<typeof healthSchema>;
