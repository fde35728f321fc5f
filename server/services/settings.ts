import { settingsSchema, type Settings, type SettingsUpdateBody } from '#shared/schemas/settings.ts';
import type { Db } from '../db/client.ts';
import { readSettingRows, writeSettingRows } from '../db/queries/settings.ts';

/** Stored settings over the defaults; a stored value that no longer validates falls back to its default. */
export async function getSettings(db: Db): Promise<Settings> {
  const stored = await readSettingRows(db);
  const merged = settingsSchema.safeParse(stored);
  if (merged.success) return merged.data;
  const bad = new Set(merged.error.issues.map((i) => String(i.path[0])));
  return settingsSchema.parse(Object.fromEntries(Object.entries(stored).filter(([k]) => !bad.has(k))));
}

export async function updateSettings(db: Db, changes: SettingsUpdateBody, actor: string): Promise<Settings> {
  await writeSettingRows(db, changes, actor);
  return getSettings(db);
}
