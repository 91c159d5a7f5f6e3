import { afterAll, describe, expect, it } from 'vitest';
import { chmodSync, mkdtempSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { resolveJwtSecret } from './jwt-secret.ts';
import { loadEnv } from './env.ts';

const root = mkdtempSync(join(tmpdir(), 'plumbline-jwtsecret-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));
const dir = (name: string) => join(root, name);

describe('JWT secret', () => {
  it('when JWT_SECRET is unset outside production, then a secret is generated into the data directory with mode 0600 and reused', () => {
    const first = resolveJwtSecret({ secret: undefined, nodeEnv: 'development', dataDir: dir('a') });
    expect(first.length).toBeGreaterThanOrEqual(32);
    expect(statSync(join(dir('a'), 'jwt-secret')).mode & 0o777).toBe(0o600);
    expect(resolveJwtSecret({ secret: undefined, nodeEnv: 'development', dataDir: dir('a') })).toBe(first);
  });

  it('when two installs generate their secrets, then they differ (no built-in constant)', () => {
    const a = loadEnv({ NODE_ENV: 'development', DATA_DIR: dir('b') }).JWT_SECRET;
    const b = loadEnv({ NODE_ENV: 'development', DATA_DIR: dir('c') }).JWT_SECRET;
    expect(a).not.toBe(b);
    expect(readFileSync(join(dir('b'), 'jwt-secret'), 'utf8')).toBe(a);
  });

  it('when an existing secret file is readable by others, then it is tightened to 0600', () => {
    const d = dir('d');
    resolveJwtSecret({ secret: undefined, nodeEnv: 'test', dataDir: d });
    const file = join(d, 'jwt-secret');
    writeFileSync(file, 'f'.repeat(64));
    chmodSync(file, 0o644);
    expect(resolveJwtSecret({ secret: undefined, nodeEnv: 'test', dataDir: d })).toBe('f'.repeat(64));
    expect(statSync(file).mode & 0o777).toBe(0o600);
  });

  it('when JWT_SECRET is unset in production, then start-up is refused with a clear message', () => {
    expect(() => loadEnv({ NODE_ENV: 'production', DATA_DIR: dir('e') })).toThrow(
      /JWT_SECRET: required in production/,
    );
  });

  it('when JWT_SECRET is given, then it is used and no file is written', () => {
    const secret = 's'.repeat(40);
    expect(loadEnv({ NODE_ENV: 'production', JWT_SECRET: secret, DATA_DIR: dir('f') }).JWT_SECRET).toBe(
      secret,
    );
  });
});
