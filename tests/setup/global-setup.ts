// Once per `vitest run`: a real PostgreSQL (a throwaway cluster, or the server of DATABASE_URL),
// with a template database migrated once. Each test file copies it (CREATE DATABASE … TEMPLATE).
import { randomBytes } from 'node:crypto';
import type { TestProject } from 'vitest/node';
import pg from 'pg';
import { closeDb, createDb } from '#server/db/client.ts';
import { startThrowawayCluster } from '#server/db/cluster.ts';
import { migrateDb } from '#server/db/migrate.ts';

declare module 'vitest' {
  export interface ProvidedContext {
    /** URL of the migrated template database. */
    templateUrl: string;
  }
}

function withDatabase(url: string, name: string): string {
  const u = new URL(url);
  u.pathname = `/${name}`;
  return u.toString();
}

export default async function setup(project: TestProject) {
  const fromEnv = process.env.DATABASE_URL?.trim();
  const cluster = fromEnv ? undefined : await startThrowawayCluster((l) => process.stderr.write(l + '\n'));
  const serverUrl = fromEnv ?? cluster!.url;
  const template = `osmia_tpl_${randomBytes(4).toString('hex')}`;
  const admin = new pg.Client({ connectionString: serverUrl });
  await admin.connect();
  await admin.query(`create database ${template}`);
  await admin.end();
  const templateUrl = withDatabase(serverUrl, template);
  const db = createDb(templateUrl, { max: 1 });
  await migrateDb(db);
  await closeDb(db);
  project.provide('templateUrl', templateUrl);

  return async () => {
    if (cluster) return cluster.dispose();
    // On a server we do not own, drop what this run created.
    const c = new pg.Client({ connectionString: serverUrl });
    await c.connect();
    const { rows } = await c.query<{ datname: string }>(`select datname from pg_database where datname like $1`, [`${template}%`]);
    for (const r of rows) await c.query(`drop database if exists ${r.datname} with (force)`);
    await c.query(`drop database if exists ${template} with (force)`);
    await c.end();
  };
}
