import { chmodSync, existsSync, mkdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { randomBytes } from 'node:crypto';
import { join } from 'node:path';

/**
 * The secret that signs sessions. In production it must be given (JWT_SECRET); elsewhere, when unset,
 * one is generated once into `<dataDir>/jwt-secret`, readable by the owner only (mode 0600), and
 * reused on the next start so sessions survive a restart. There is no built-in fallback value.
 */
export function resolveJwtSecret(input: {
  secret: string | undefined;
  nodeEnv: string;
  dataDir: string;
}): string {
  if (input.secret) return input.secret;
  if (input.nodeEnv === 'production') {
    throw new Error('Invalid configuration:\n  JWT_SECRET: required in production (at least 32 characters)');
  }
  const file = join(input.dataDir, 'jwt-secret');
  mkdirSync(input.dataDir, { recursive: true });
  if (!existsSync(file)) {
    // 'wx' fails if another process created it meanwhile; that one's secret is then read below.
    try {
      writeFileSync(file, randomBytes(48).toString('hex'), { mode: 0o600, flag: 'wx' });
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code !== 'EEXIST') throw err;
    }
  }
  // A file left readable by others (e.g. written by an older start script) is tightened.
  if ((statSync(file).mode & 0o077) !== 0) chmodSync(file, 0o600);
  const secret = readFileSync(file, 'utf8').trim();
  if (secret.length < 32)
    throw new Error(`Invalid configuration:\n  ${file}: the secret is shorter than 32 characters`);
  return secret;
}
