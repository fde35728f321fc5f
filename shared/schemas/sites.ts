import { z } from 'zod';

export const siteSchema = z.object({ code: z.string(), name: z.string(), timeZone: z.string() });
export type Site = z.infer<typeof siteSchema>;

export const siteListSchema = z.object({ sites: z.array(siteSchema) });
export type SiteList = z.infer<typeof siteListSchema>;
