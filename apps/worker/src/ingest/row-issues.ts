import type { z } from 'zod';
import type { RowErrorCode } from '@plumbline/contracts';

/** How a row check reports a problem: a zod refinement context, or just a flag (see row-schemas.ts). */
export type Ctx = Pick<z.RefinementCtx, 'addIssue'>;

/** A context that only notes whether a check added an issue (see above). */
export class IssueFlag implements Ctx {
  failed = false;
  addIssue(): void {
    this.failed = true;
  }
}

/** Adds an issue carrying our row error code and the column; returns undefined for the caller's value. */
export function reject(ctx: Ctx, column: string, code: RowErrorCode, message: string): undefined {
  ctx.addIssue({ code: 'custom', message, params: { code }, path: [column] });
  return undefined;
}
