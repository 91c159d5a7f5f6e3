import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { AppError } from '../errors/app-error.ts';

// Common passwords of 12 characters or more, lower-cased (see scripts/generate-common-passwords.sh).
let commonPasswords: Set<string> | null = null;

function loadCommonPasswords(): Set<string> {
  commonPasswords ??= new Set(
    readFileSync(join(import.meta.dirname, 'data/common-passwords.txt'), 'utf8')
      .split('\n')
      .filter((line) => line.length > 0),
  );
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
