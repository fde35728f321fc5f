import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { errorBodySchema } from '#shared/schemas/error.ts';
import { importDetailSchema, importHistorySchema, importRecordSchema } from '#shared/schemas/imports.ts';
import { createTestApp, type TestApp } from '../../setup/app.ts';
import { plant } from '../importers/helpers.ts';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({ UPLOAD_LIMIT_MB: '0.01' });
});
afterAll(() => t.close());

const upload = (fields: Record<string, string>, name: string, content: string | Buffer, role: 'engineer' | 'admin' = 'engineer') => {
  const req = request(t.app).post('/api/imports').set('Cookie', t.cookies[role]);
  for (const [k, v] of Object.entries(fields)) req.field(k, v);
  return req.attach('file', Buffer.from(content), name);
};

describe('POST /api/imports', () => {
  it('runs the same importer as the CLI and answers the import record', async () => {
    const res = await upload({ kind: 'assets', site: 'UPL', tz: 'Europe/Lisbon' }, 'assets.csv', plant.assets);
    expect(res.status).toBe(201);
    const record = importRecordSchema.parse(res.body);
    expect(record).toMatchObject({ kind: 'assets', site: 'UPL', file: 'assets.csv', status: 'completed', rowsInserted: 5, actor: 'engineer@test.example' });
    const again = await upload({ kind: 'assets', site: 'UPL' }, 'assets-copy.csv', plant.assets);
    expect(importRecordSchema.parse(again.body).status).toBe('duplicate');
  });

  it('keeps the rejects and serves them as CSV', async () => {
    const bad = 'tag,asset,quantity,unit\nA.RUN,TR1,run_status,\nA.X,NOPE,feed_flow,m3/h\nA.Y,TR1,feed_flow,"=1+2"\n=cmd,NOPE,feed_flow,m3/h\n';
    const res = await upload({ kind: 'tags', site: 'UPL' }, 'tags.csv', bad);
    expect(res.status).toBe(201);
    const record = importRecordSchema.parse(res.body);
    expect(record.status).toBe('partial');
    const detail = importDetailSchema.parse((await request(t.app).get(`/api/imports/${record.id}`).set('Cookie', t.cookies.engineer)).body);
    expect(detail.rejects.map((r) => r.line)).toEqual([3, 4, 5]);
    const csv = await request(t.app).get(`/api/imports/${record.id}/rejects.csv`).set('Cookie', t.cookies.engineer);
    expect(csv.status).toBe(200);
    expect(csv.type).toBe('text/csv');
    expect(csv.text.split('\r\n')[0]).toBe('line,reason,row');
    expect(csv.text).toContain('3,"unknown asset ""NOPE"" on site UPL"');
    expect(csv.text).toContain('"A.Y,TR1,feed_flow,=1+2"');
    // A cell that would start a spreadsheet formula goes out prefixed, so it shows as text.
    expect(csv.text).toContain(`"'=cmd,NOPE,feed_flow,m3/h"`);
  });

  it('lists the history newest first', async () => {
    const res = await request(t.app).get('/api/imports?limit=2').set('Cookie', t.cookies.admin);
    const list = importHistorySchema.parse(res.body).imports;
    expect(list).toHaveLength(2);
    expect(list[0].id! > list[1].id!).toBe(true);
  });

  it('refuses a file over the size limit with 413 and a clear message', async () => {
    const res = await upload({ kind: 'historian', site: 'UPL' }, 'big.csv', 'x'.repeat(20_000));
    expect(res.status).toBe(413);
    expect(errorBodySchema.parse(res.body).error).toMatchObject({ code: 'file-too-large', message: expect.stringMatching(/0.01 MB/) });
  });

  it('refuses a missing file, an unknown kind, and answers 422 for a file refused whole', async () => {
    const noFile = await request(t.app).post('/api/imports').set('Cookie', t.cookies.admin).field('kind', 'assets');
    expect(noFile.status).toBe(400);
    expect(errorBodySchema.parse(noFile.body).error.code).toBe('file-missing');
    const badKind = await upload({ kind: 'recipes' }, 'x.csv', 'a,b\n');
    expect(badKind.status).toBe(400);
    const empty = await upload({ kind: 'tags', site: 'UPL' }, 'empty.csv', '');
    expect(empty.status).toBe(422);
    expect(importRecordSchema.parse(empty.body).error).toMatch(/empty/);
  });

  it('GET /api/imports/:id of an unknown id is a 404', async () => {
    const res = await request(t.app).get('/api/imports/999999').set('Cookie', t.cookies.admin);
    expect(res.status).toBe(404);
    expect(errorBodySchema.parse(res.body).error.code).toBe('import-not-found');
  });
});
