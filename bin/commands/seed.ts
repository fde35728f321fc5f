import type { Command } from 'commander';
import type { Db } from '#server/db/client.ts';

export async function seedDemoPlantIfEmpty(_db: Db, _log: (l: string) => void): Promise<void> {}

export function registerSeed(_program: Command) {}
