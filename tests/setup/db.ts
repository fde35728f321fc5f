import { randomBytes } from 'node:crypto';
import pg from 'pg';
import { inject } from 'vitest';
import { createDb, closeDb, type Db } from '#server/db/client.ts';

export interface TestDatabase {
  url: string;
  db: Db;
  close: () => Promise<void>;
}

/** A fresh, migrated database of this test file's own, copied from the run's template. */
export async function createTestDatabase(): Promise<TestDatabase> {
  const templateUrl = inject('templateUrl');
  const template = new URL(templateUrl).pathname.slice(1);
  const name = `${template}_${randomBytes(4).toString('hex')}`;
  const maintenance = new URL(templateUrl);
  maintenance.pathname = '/postgres';
  const admin = new pg.Client({ connectionString: maintenance.toString() });
  await admin.connect();
  // CREATE DATABASE … TEMPLATE needs the template unused; retry while another file copies it.
  for (let attempt = 0; ; attempt++) {
    try {
      await admin.query(`create database ${name} template ${template}`);
      break;
    } catch (err) {
      if (attempt > 50 || !String((err as Error).message).includes('being accessed')) throw err;
      await new Promise((r) => setTimeout(r, 100 + Math.random() * 200));
    }
  }
  await admin.end();
  const u = new URL(templateUrl);
  u.pathname = `/${name}`;
  const url = u.toString();
  const db = createDb(url, { max: 5 });
  return { url, db, close: () => closeDb(db) };
}
