import type { RowError } from '@plumbline/contracts';

/** A problem with the file as a whole (not one row): it cannot be read at all. Never worth a retry. */
export class FileFormatError extends Error {
  constructor(readonly error: RowError) {
    super(error.message);
    this.name = 'FileFormatError';
  }
}
