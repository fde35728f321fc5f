import { settingsDefaults, settingsSchema, settingsUpdateBodySchema, type Settings, type SettingsUpdateBody } from '#shared/schemas/settings.ts';
import type { Db } from '../db/client.ts';
import { readSettingRows, writeSettingRows } from '../db/queries/settings.ts';

/** Stored settings over the defaults; a stored value that no longer validates falls back to its default. */
export async function getSettings(db: Db): Promise<Settings> {
  const valid: Partial<Settings> = {};
  for (const [key, value] of Object.entries(await readSettingRows(db))) {
    const one = settingsUpdateBodySchema.strip().safeParse({ [key]: value });
    if (one.success) Object.assign(valid, one.data);
  }
  return settingsSchema.parse({ ...settingsDefaults, ...valid });
}

/** Write only the keys given; the others keep their stored value. */
export async function updateSettings(db: Db, changes: SettingsUpdateBody, actor: string): Promise<Settings> {
  await writeSettingRows(db, changes, actor);
  return getSettings(db);
}
