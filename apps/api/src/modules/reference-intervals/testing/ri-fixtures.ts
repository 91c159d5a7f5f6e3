import request from 'supertest';
import { randomBytes } from 'node:crypto';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { sql } from 'drizzle-orm';
import { analytes } from '@plumbline/db';
import type { TestApp } from '../../../testing/test-app.ts';

/** Sodium, potassium and creatinine with LOINC codes and plausibility limits (common practice). */
export async function makeRiAnalytes(t: TestApp) {
  const tag = randomBytes(3).toString('hex');
  const [sodium, potassium, creatinine] = await t.db
    .insert(analytes)
    .values([
      {
        code: `NA-${tag}`,
        name: 'Sodium',
        loinc: '2951-2',
        unit: 'mmol/L',
        plausibleLow: 80,
        plausibleHigh: 200,
      },
      {
        code: `K-${tag}`,
        name: 'Potassium',
        loinc: '2823-3',
        unit: 'mmol/L',
        plausibleLow: 1,
        plausibleHigh: 10,
      },
      {
        code: `CREA-${tag}`,
        name: 'Creatinine',
        loinc: '2160-0',
        unit: 'umol/L',
        molarMass: 113.12,
        plausibleLow: 5,
        plausibleHigh: 3000,
      },
    ])
    .returning();
  return { sodium, potassium, creatinine };
}

export function uploadFile(
  t: TestApp,
  auth: string,
  content: string,
  kind: string,
  filename = 'results.csv',
) {
  return request(t.app)
    .post('/api/uploads')
    .set('Authorization', auth)
    .field('kind', kind)
    .attach('file', Buffer.from(content, 'utf8'), filename);
}

export async function waitForUpload(t: TestApp, auth: string, id: string, output: () => string) {
  for (let i = 0; i < 600; i++) {
    const res = await request(t.app).get(`/api/uploads/${id}`).set('Authorization', auth);
    if (['stored', 'needs-review', 'failed'].includes(res.body.status)) return res.body;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error(`upload ${id} never finished:\n${output()}`);
}

export async function waitForStudy(t: TestApp, auth: string, id: string, output: () => string) {
  for (let i = 0; i < 1200; i++) {
    const res = await request(t.app).get(`/api/reference-intervals/studies/${id}`).set('Authorization', auth);
    if (['done', 'failed'].includes(res.body.status)) return res.body;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error(`study ${id} never finished:\n${output()}`);
}

/** Every text the service kept anywhere: all database tables, the upload storage, Redis under the test prefix. */
export async function everythingKept(t: TestApp): Promise<string> {
  const parts: string[] = [];
  const tables = await t.db.execute<{ tablename: string }>(
    sql`select tablename from pg_tables where schemaname = 'public'`,
  );
  for (const { tablename } of tables.rows) {
    const rows = await t.db.execute<{ dump: string | null }>(
      sql.raw(`select string_agg(t::text, ' ') as dump from "${tablename}" t`),
    );
    parts.push(rows.rows[0]?.dump ?? '');
  }
  const walk = (dir: string) => {
    for (const name of readdirSync(dir)) {
      const path = join(dir, name);
      if (statSync(path).isDirectory()) walk(path);
      else parts.push(readFileSync(path, 'latin1'));
    }
  };
  walk(t.storageDir);
  const redis = t.deps.redis;
  let cursor = '0';
  do {
    const [next, keys] = await redis.scan(cursor, 'MATCH', `${t.queuePrefix}:*`, 'COUNT', 500);
    for (const key of keys) {
      parts.push(key);
      const type = await redis.type(key);
      if (type === 'string') parts.push((await redis.get(key)) ?? '');
      if (type === 'hash') parts.push(JSON.stringify(await redis.hgetall(key)));
      if (type === 'list') parts.push(JSON.stringify(await redis.lrange(key, 0, -1)));
      if (type === 'set') parts.push(JSON.stringify(await redis.smembers(key)));
      if (type === 'zset') parts.push(JSON.stringify(await redis.zrange(key, 0, -1)));
      if (type === 'stream') parts.push(JSON.stringify(await redis.xrange(key, '-', '+')));
    }
    cursor = next;
  } while (cursor !== '0');
  return parts.join('\n');
}
