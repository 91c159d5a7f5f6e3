import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { Writable } from 'node:stream';
import { randomBytes } from 'node:crypto';
import { Queue } from 'bullmq';
import { INGEST_QUEUE_NAME, ingestJobId } from '@plumbline/contracts';
import { createLogger, logContext } from '@plumbline/db/logging';
import { createTestApp, TEST_PASSWORD, type TestApp } from '../testing/test-app.ts';

// Every log line of this app goes here, at the most detailed level.
const lines: string[] = [];
const capture = new Writable({
  write(chunk: Buffer, _encoding, done) {
    lines.push(...chunk.toString('utf8').split('\n').filter(Boolean));
    done();
  },
});
const logger = createLogger('api', { level: 'trace', destination: capture });

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp('logsecrets', { logger });
});
afterAll(async () => t?.close());

const planted = {
  password: `planted-pass-${randomBytes(6).toString('hex')}`,
  email: `planted-${randomBytes(4).toString('hex')}@person.example`,
  cellText: `PLANTEDCELL${randomBytes(4).toString('hex')}`,
  cellValue: '987654.3217',
};

describe('logs carry no secrets', () => {
  it('when sign-in, invitations, tokens and uploads run, then no log line holds a password, token, e-mail or data value', async () => {
    const lab = await t.makeLab();
    const supervisor = await t.makeUser('supervisor', lab.id);
    const coordinator = await t.makeUser('coordinator', null);

    // Sign-in: a wrong password, then the right one (the session cookie comes back).
    await request(t.app)
      .post('/api/auth/login')
      .send({ email: supervisor.email, password: planted.password });
    const login = await request(t.app)
      .post('/api/auth/login')
      .send({ email: supervisor.email, password: TEST_PASSWORD });
    const cookies = ([] as string[]).concat(login.headers['set-cookie'] ?? []);
    const sessionCookie = cookies[0].split(';')[0].split('=')[1];
    await request(t.app)
      .get('/api/me')
      .set('Cookie', cookies.map((c) => c.split(';')[0]).join('; '));

    // An invitation to a planted address, opened and accepted with a planted password.
    const invited = await request(t.app)
      .post(`/api/labs/${lab.id}/invitations`)
      .set('Authorization', supervisor.auth)
      .send({ email: planted.email, name: 'Planted Person', role: 'analyst' });
    const invitationToken = invited.body.link.split('/invitations/')[1] as string;
    await request(t.app).get(`/api/invitations/${invitationToken}`);
    await request(t.app)
      .post('/api/invitations/accept')
      .send({ token: invitationToken, password: planted.password });

    // A lab API token, created and used (also on a route it may not use).
    const created = await request(t.app)
      .post(`/api/labs/${lab.id}/api-tokens`)
      .set('Authorization', supervisor.auth)
      .send({ name: 'Bench middleware' });
    const labToken = created.body.token as string;
    await request(t.app)
      .get(`/api/uploads/${crypto.randomUUID()}`)
      .set('Authorization', `Bearer ${labToken}`);
    await request(t.app).get('/api/me').set('Authorization', `Bearer ${labToken}`);

    // An upload whose cells hold planted values, previewed and sent; a query string with a planted e-mail.
    const csv = `procedure,control_lot,level,run_date,value\nP1,${planted.cellText},1,2026-01-05,${planted.cellValue}\n`;
    await request(t.app)
      .post('/api/uploads/preview')
      .set('Authorization', supervisor.auth)
      .field('kind', 'qc-values')
      .attach('file', Buffer.from(csv), 'month.csv');
    await request(t.app)
      .post('/api/uploads')
      .set('Authorization', `Bearer ${labToken}`)
      .field('kind', 'qc-values')
      .attach('file', Buffer.from(csv), 'month.csv');
    await request(t.app)
      .get(`/api/audit-events?q=${encodeURIComponent(planted.email)}`)
      .set('Authorization', coordinator.auth);

    const secrets = {
      ...planted,
      testPassword: TEST_PASSWORD,
      invitationToken,
      labToken,
      sessionCookie,
      bearerJwt: supervisor.token,
      supervisorEmail: supervisor.email,
    };
    expect(lines.length).toBeGreaterThan(10);
    const found = Object.entries(secrets).flatMap(([name, secret]) =>
      lines.filter((line) => line.includes(secret)).map((line) => `${name}: ${line.slice(0, 300)}`),
    );
    expect(found).toEqual([]);
  });

  it('when a request is logged, then the line is JSON with the request id the answer carries', async () => {
    const res = await request(t.app).get('/api/health');
    const id = res.headers['x-request-id'];
    const line = lines.map((l) => JSON.parse(l)).find((l) => l.req?.id === id);
    expect(line).toMatchObject({
      name: 'api',
      req: { id, method: 'GET', path: '/api/health' },
      res: { statusCode: 200 },
    });
  });

  it('when an upload is enqueued, then its job carries the request id, and lines logged for the job carry both ids', async () => {
    const lab = await t.makeLab();
    const analyst = await t.makeUser('analyst', lab.id);
    const res = await request(t.app)
      .post('/api/uploads')
      .set('Authorization', analyst.auth)
      .field('kind', 'qc-values')
      .attach('file', Buffer.from('procedure,value\nP1,1\n'), 'month.csv');
    expect(res.status).toBe(202);
    const queue = new Queue(INGEST_QUEUE_NAME, { connection: t.deps.redis, prefix: t.queuePrefix });
    try {
      const job = await queue.getJob(ingestJobId(res.body.id, 'initial'));
      expect(job?.data).toEqual({ uploadId: res.body.id, requestId: res.headers['x-request-id'] });
    } finally {
      await queue.close();
    }
    const before = lines.length;
    logContext.run({ requestId: 'request-1', uploadId: res.body.id }, () => logger.info('stored'));
    expect(JSON.parse(lines[before])).toMatchObject({
      requestId: 'request-1',
      uploadId: res.body.id,
      msg: 'stored',
    });
  });

  it('when an unexpected error carries query parameters and a database detail, then neither reaches the log', () => {
    const before = lines.length;
    const cause = Object.assign(new Error(`duplicate key value violates unique constraint`), {
      code: '23505',
      detail: `Key (email)=(${planted.email}) already exists.`,
    });
    const err = new Error(
      `Failed query: insert into users values ($1, $2)\nparams: ${planted.email},${planted.password}`,
      {
        cause: Object.assign(cause, { message: `${cause.message} Key (email)=(${planted.email})` }),
      },
    );
    logger.error({ err }, 'request failed with an unexpected error');
    const written = lines.slice(before).join('\n');
    expect(written).toContain('Failed query: insert into users');
    expect(written).toContain('23505');
    expect(written).not.toContain(planted.email);
    expect(written).not.toContain(planted.password);
  });
});
