import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import request from 'supertest';
import { randomBytes } from 'node:crypto';
import { Redis } from 'ioredis';
import { createTestApp, TEST_PASSWORD, type TestApp } from '../../testing/test-app.ts';
import { createSignInThrottle } from '../../auth/sign-in-throttle.ts';

// Counts password verifications, to show unknown accounts are verified like known ones.
const verifications = vi.hoisted(() => ({ count: 0 }));
vi.mock('../../auth/passwords.ts', async (importOriginal) => {
  const original = await importOriginal<typeof import('../../auth/passwords.ts')>();
  return {
    ...original,
    verifyPassword: async (hash: string | null, password: string) => {
      verifications.count += 1;
      return original.verifyPassword(hash, password);
    },
  };
});

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp('signinthrottle');
});
afterAll(async () => t?.close());

// Each test signs in from its own forwarded address (the app trusts the loopback proxy), so the
// per-address counts of one test do not lock out the next.
const address = () => `10.${[1, 2, 3].map(() => Math.floor(Math.random() * 250) + 1).join('.')}`;
const login = (email: string, password: string, from: string) =>
  request(t.app).post('/api/auth/login').set('X-Forwarded-For', from).send({ email, password });

describe('sign-in throttling', () => {
  it('when 100 wrong passwords are tried, then the right one is refused with 429 and Retry-After', async () => {
    const user = await t.makeUser('analyst', (await t.makeLab()).id);
    const from = address();
    const statuses = new Set<number>();
    for (let i = 0; i < 100; i += 1)
      statuses.add((await login(user.email, `wrong-password-${i}`, from)).status);
    expect([...statuses].sort()).toEqual([401, 429]);
    const res = await login(user.email, TEST_PASSWORD, from);
    expect(res.status).toBe(429);
    expect(res.body.error.code).toBe('too_many_requests');
    expect(res.body.error.message).toMatch(/Too many failed sign-in attempts\. Try again in/);
    expect(Number(res.headers['retry-after'])).toBeGreaterThan(0);
  });

  it('when an account is locked, then another address is refused too; other accounts still sign in', async () => {
    const lab = await t.makeLab();
    const locked = await t.makeUser('analyst', lab.id);
    const other = await t.makeUser('analyst', lab.id);
    for (let i = 0; i < t.env.SIGNIN_FAILURES_PER_ACCOUNT; i += 1)
      await login(locked.email, 'wrong', address());
    expect((await login(locked.email, TEST_PASSWORD, address())).status).toBe(429);
    expect((await login(other.email, TEST_PASSWORD, address())).status).toBe(200);
  });

  it('when one address fails on many accounts, then that address is locked out', async () => {
    const from = address();
    for (let i = 0; i < t.env.SIGNIN_FAILURES_PER_ADDRESS; i += 1) {
      await login(`nobody-${i}-${randomBytes(3).toString('hex')}@test.example`, 'wrong', from);
    }
    const user = await t.makeUser('analyst', (await t.makeLab()).id);
    expect((await login(user.email, TEST_PASSWORD, from)).status).toBe(429);
    expect((await login(user.email, TEST_PASSWORD, address())).status).toBe(200);
  });

  it('when sign-in succeeds, then the account failures start again from zero', async () => {
    const user = await t.makeUser('analyst', (await t.makeLab()).id);
    const from = address();
    const below = t.env.SIGNIN_FAILURES_PER_ACCOUNT - 1;
    for (let i = 0; i < below; i += 1) await login(user.email, 'wrong', from);
    expect((await login(user.email, TEST_PASSWORD, from)).status).toBe(200);
    for (let i = 0; i < below; i += 1) await login(user.email, 'wrong', from);
    expect((await login(user.email, TEST_PASSWORD, from)).status).toBe(200);
  });

  it('when the account does not exist, then the password is still verified and the answer is the same 401', async () => {
    const user = await t.makeUser('analyst', (await t.makeLab()).id);
    const before = verifications.count;
    const unknown = await login(`nobody-${randomBytes(4).toString('hex')}@test.example`, 'wrong', address());
    const wrong = await login(user.email, 'wrong', address());
    expect(verifications.count - before).toBe(2);
    expect(unknown.status).toBe(401);
    expect(unknown.body.error.message).toBe(wrong.body.error.message);
  });
});

describe('lockout backoff', () => {
  it('when a key is locked out again within a day, then the lockout doubles up to the maximum', async () => {
    const prefix = `${t.queuePrefix}:backoff`;
    const throttle = createSignInThrottle(t.deps.redis, prefix, {
      failuresPerAccount: 3,
      failuresPerAddress: 1000,
      windowSeconds: 900,
      lockoutSeconds: 60,
      lockoutMaxSeconds: 200,
    });
    const keys = { account: 'someone@test.example', address: '10.0.0.1' };
    const waits: number[] = [];
    for (let round = 0; round < 3; round += 1) {
      for (let i = 0; i < 3; i += 1) await throttle.recordFailure(keys);
      waits.push(await throttle.lockedFor(keys));
      // The lockout ends (as if its time had passed); the count of lockouts stays.
      await t.deps.redis.del(`${prefix}:signin:account:${keys.account}`);
      expect(await throttle.lockedFor(keys)).toBe(0);
    }
    // 60 s, then doubled to 120 s, then capped at 200 s (the settings above).
    expect(waits).toEqual([60, 120, 200]);
  });
});

describe('Redis away', () => {
  it('when Redis is not reachable, then failures are counted in memory and the lockout still applies', async () => {
    // Never connected: the limiter must not wait for it.
    const away = new Redis('redis://127.0.0.1:1', { lazyConnect: true, maxRetriesPerRequest: null });
    try {
      const throttle = createSignInThrottle(away, 'away', {
        failuresPerAccount: 3,
        failuresPerAddress: 1000,
        windowSeconds: 900,
        lockoutSeconds: 60,
        lockoutMaxSeconds: 3600,
      });
      const keys = { account: 'someone@test.example', address: '10.0.0.2' };
      expect(await throttle.lockedFor(keys)).toBe(0);
      for (let i = 0; i < 3; i += 1) await throttle.recordFailure(keys);
      expect(await throttle.lockedFor(keys)).toBe(60);
    } finally {
      away.disconnect();
    }
  });
});
