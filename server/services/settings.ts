import { settingsDefaults, settingsSchema, settingsUpdateBodySchema, type Settings, type SettingsUpdateBody } from '#shared/schemas/settings.ts';
import type { Db } from '../db/client.ts';
import { readSettingRows, writeSettingRows } from '../db/queries/settings.ts';

/** Stored settings over the defaults; a stored value that no longer validates falls back to its default. */
export async function getSettings(db: Db): Promise<Settings> {
  return settingsOf(await readSettingRows(db));
}

/** `getSettings` of stored rows (key → value) already read. */
export function settingsOf(stored: Record<string, unknown>): Settings {
  // Every KPI request reads the settings: one validation of them all, key by key only when that fails.
  const all = settingsUpdateBodySchema.strip().safeParse(stored);
  const valid: Partial<Settings> = all.success ? all.data : {};
  if (!all.success) {
    for (const [key, value] of Object.entries(stored)) {
      const one = settingsUpdateBodySchema.strip().safeParse({ [key]: value });
      if (one.success) Object.assign(valid, one.data);
    }
  }
  return settingsSchema.parse({ ...settingsDefaults, ...valid });
}

/** Write only the keys given; the others keep their stored value. */
export async function updateSettings(db: Db, changes: SettingsUpdateBody, actor: string): Promise<Settings> {
  await writeSettingRows(db, changes, actor);
  return getSettings(db);
}
