import type pg from 'pg';
import {
  allowsDecimalComma,
  canonicalColumns,
  duplicateHeader,
  suggestMapping,
  type RowError,
} from '@plumbline/contracts';
import { dbOnClient, recordAudit, requestPeerStatistics, thresholds, type Database } from '@plumbline/db';
import type { FileSource } from '../storage/file-source.ts';
import { FileFormatError, openCsv, type CsvRecord } from '../ingest/csv-reader.ts';
import {
  IssueFlag,
  checkSummaryCells,
  checkValueCells,
  rowErrorsOf,
  summaryRowSchema,
  valueRowSchema,
  type RowContext,
  type SummaryCells,
  type SummaryRow,
  type ValueCells,
} from '../ingest/row-schemas.ts';
import { UnitConverter } from '../ingest/units.ts';
import { ValuesBuffer } from '../ingest/values-buffer.ts';
import { storeSummaries, storeValues, type StoreContext } from '../ingest/store.ts';
import * as repo from '../ingest/ingest.repository.ts';
import { processPatientUpload } from '../patients/patient-upload.job.ts';
import { isPatientUploadKind } from '@plumbline/contracts';

export type IngestDeps = {
  db: Database;
  pool: pg.Pool;
  files: FileSource;
  /** Labs a peer group needs before its figures are published. */
  minLabs: number;
  /** Crash-recovery tests only: keep the storing transaction open this long before COMMIT. */
  holdBeforeCommitMs?: number;
  /** At most this many row errors are stored per upload (all are counted). */
  maxStoredErrors?: number;
  log?: (message: string) => void;
  /** Salt of the hash that replaces a patient file's sample keys. */
  sampleKeySalt?: string;
};

export type IngestOutcome = 'stored' | 'needs-review' | 'failed' | 'skipped';

/** One shared converter: UCUM conversions are computed once per unit pair and molar mass. */
const units = new UnitConverter();

/**
 * Processes one upload, exactly once: reads the file as a stream, checks every row, and either stops at
 * needs-review (rejected rows, not yet confirmed), fails (the file cannot be read), or stores the valid
 * rows in one transaction together with the 'stored' status and the requests to recompute the peer
 * statistics they touch (the caller then kicks the recompute). PostgreSQL holds the state, so running it
 * again — after a crash, or as a duplicate job — never stores twice.
 */
export async function processUpload(
  deps: IngestDeps,
  uploadId: string,
  reportProgress: (progress: number) => Promise<void> = async () => {},
): Promise<IngestOutcome> {
  const log = deps.log ?? (() => {});
  const upload = await repo.claimUpload(deps.db, uploadId);
  if (!upload) {
    const current = await repo.loadUpload(deps.db, uploadId);
    return current?.storedAt ? 'stored' : 'skipped';
  }

  // Progress is saved at most every 250 ms, the first time 250 ms after the start: a small file is
  // stored before anyone could watch it move.
  let lastSaved = Date.now();
  const progress = async (value: number) => {
    const now = Date.now();
    if (now - lastSaved < 250) return;
    lastSaved = now;
    const clamped = Math.max(0, Math.min(1, value));
    await Promise.all([reportProgress(clamped), repo.saveProgress(deps.db, uploadId, clamped)]);
  };

  if (isPatientUploadKind(upload.kind)) return processPatientUpload(deps, upload, progress);

  const t0 = performance.now();
  let read: ReadResult;
  try {
    read = await readUpload(deps, upload, (fraction) => progress(0.6 * fraction));
  } catch (error) {
    if (error instanceof FileFormatError) {
      await repo.markFailed(deps.db, uploadId, error.message, [error.error], 1);
      log(`upload ${uploadId}: failed: ${error.message}`);
      return 'failed';
    }
    throw error;
  }

  const counts = {
    rowsTotal: read.rowsTotal,
    rowsAccepted: read.rowsAccepted,
    rowsRejected: read.rowsRejected,
  };
  if (read.rowsRejected > 0 && !upload.confirmedAt) {
    await repo.markNeedsReview(deps.db, uploadId, counts, read.errors, read.errorsTotal);
    log(`upload ${uploadId}: needs review (${read.rowsRejected} of ${read.rowsTotal} rows rejected)`);
    return 'needs-review';
  }
  if (read.rowsAccepted === 0) {
    await repo.markFailed(
      deps.db,
      uploadId,
      'No row of the file is valid, so nothing was stored.',
      read.errors,
      read.errorsTotal,
    );
    return 'failed';
  }

  await progress(0.6);
  const t1 = performance.now();
  const stored = await storeInOneTransaction(deps, upload, read, counts, (fraction) =>
    progress(0.6 + 0.4 * fraction),
  );
  if (!stored) return 'skipped';
  await reportProgress(1);
  log(
    `upload ${uploadId}: stored ${read.rowsAccepted} rows (read ${Math.round(t1 - t0)} ms, store ${Math.round(performance.now() - t1)} ms)`,
  );
  return 'stored';
}

type ReadResult = {
  rowsTotal: number;
  rowsAccepted: number;
  rowsRejected: number;
  /** The first row errors, each message bounded (see addErrors). */
  errors: RowError[];
  /** Every row error found. */
  errorsTotal: number;
  summaries: SummaryRow[];
  values: ValuesBuffer;
};

/** Streams the file through the row checks; accepted rows are kept compactly, the file never whole. */
async function readUpload(
  deps: IngestDeps,
  upload: repo.UploadRecord,
  onFraction: (fraction: number) => Promise<void>,
): Promise<ReadResult> {
  const lookups = await repo.loadRowLookups(deps.db, upload.labId, upload.kind);
  let source;
  try {
    source = await deps.files.open(upload.storageKey);
  } catch {
    throw new FileFormatError({
      row: 1,
      column: null,
      code: 'malformed_csv',
      message: 'The uploaded file is no longer in storage; upload it again.',
    });
  }
  let bytesRead = 0;
  const csv = await openCsv(
    source,
    (n) => {
      bytesRead += n;
    },
    () => deps.files.open(upload.storageKey),
  );
  const batches = csv.batches[Symbol.asyncIterator]();
  let batch: CsvRecord[] = [];
  let next = 0;
  while (next >= batch.length) {
    const more = await batches.next();
    if (more.done) {
      throw new FileFormatError({
        row: 1,
        column: null,
        code: 'missing_column',
        message: 'The file is empty: it has no header line.',
      });
    }
    batch = more.value;
  }
  const headerLine = batch[next++];
  const headers = headerLine.cells.map((h) => h.trim());
  const repeated = duplicateHeader(headers);
  if (repeated !== null) {
    throw new FileFormatError({
      row: 1,
      column: repeated,
      code: 'duplicate_column',
      message: `The header names the column "${repeated}" more than once; which one holds the data cannot be told. Remove or rename one of them.`,
    });
  }
  const columns = resolveColumns(upload, headers, lookups.mapping);
  const limits = thresholds();

  const context: RowContext = {
    decimalComma: allowsDecimalComma(csv.delimiter),
    procedures: lookups.procedures,
    lots: lookups.lots,
    periods: lookups.periods,
    units,
    limits: { maxCvPct: limits.maxCvPct, maxN: limits.maxN },
  };
  const result: ReadResult = {
    rowsTotal: 0,
    rowsAccepted: 0,
    rowsRejected: 0,
    errors: [],
    errorsTotal: 0,
    summaries: [],
    values: new ValuesBuffer(),
  };
  // A file can carry any number of bad rows and any size of cell: what is kept stays small.
  const maxStoredErrors = deps.maxStoredErrors ?? limits.maxRowErrors;
  const addErrors = (errors: RowError[]) => {
    result.errorsTotal += errors.length;
    for (const e of errors)
      if (result.errors.length < maxStoredErrors) result.errors.push(repo.boundError(e));
  };
  const summaryLines = new Map<string, number>();
  const summarySchema = upload.kind === 'qc-summary' ? summaryRowSchema(context) : null;
  const valueSchema = upload.kind === 'qc-values' ? valueRowSchema(context) : null;
  // The file column of each canonical column, -1 when the file has none (an optional column left out).
  const at = (name: string) => columns.indexOf[name] ?? -1;
  const valueColumns = {
    measured_at: at('measured_at'),
    procedure: at('procedure'),
    control_lot: at('control_lot'),
    level: at('level'),
    value: at('value'),
    unit: at('unit'),
    run: at('run'),
    comment: at('comment'),
  };
  const summaryColumns = {
    period: at('period'),
    procedure: at('procedure'),
    control_lot: at('control_lot'),
    level: at('level'),
    n: at('n'),
    mean: at('mean'),
    sd: at('sd'),
    unit: at('unit'),
  };
  const issues = new IssueFlag();

  while (true) {
    for (; next < batch.length; next++) {
      const { line, cells } = batch[next];
      result.rowsTotal += 1;

      let rowErrors: RowError[] | null = null;
      if (cells.length > headers.length && cells.slice(headers.length).some((c) => c.trim() !== '')) {
        rowErrors = [
          {
            row: line,
            column: null,
            code: 'wrong_column_count',
            message: `the line has ${cells.length} cells but the header has ${headers.length} columns`,
          },
        ];
      }

      if (valueSchema) {
        const raw: ValueCells = {
          measured_at: cell(cells, valueColumns.measured_at),
          procedure: cell(cells, valueColumns.procedure),
          control_lot: cell(cells, valueColumns.control_lot),
          level: cell(cells, valueColumns.level),
          value: cell(cells, valueColumns.value),
          unit: cell(cells, valueColumns.unit),
          run: cell(cells, valueColumns.run),
          comment: cell(cells, valueColumns.comment),
        };
        issues.failed = false;
        const row = checkValueCells(raw, issues, context);
        if (issues.failed) {
          // The schema runs the same checks and says what is wrong.
          const parsed = valueSchema.safeParse(raw);
          if (!parsed.success) {
            rowErrors ??= [];
            rowErrors.push(...rowErrorsOf(parsed.error.issues, line, columns.headerOf));
          }
        } else if (rowErrors === null) result.values.add(row);
      } else if (summarySchema) {
        const raw: SummaryCells = {
          period: cell(cells, summaryColumns.period),
          procedure: cell(cells, summaryColumns.procedure),
          control_lot: cell(cells, summaryColumns.control_lot),
          level: cell(cells, summaryColumns.level),
          n: cell(cells, summaryColumns.n),
          mean: cell(cells, summaryColumns.mean),
          sd: cell(cells, summaryColumns.sd),
          unit: cell(cells, summaryColumns.unit),
        };
        issues.failed = false;
        const row = checkSummaryCells(raw, issues, context);
        if (issues.failed) {
          const parsed = summarySchema.safeParse(raw);
          if (!parsed.success) {
            rowErrors ??= [];
            rowErrors.push(...rowErrorsOf(parsed.error.issues, line, columns.headerOf));
          }
        } else if (rowErrors === null) {
          const key = `${row.procedure.id}|${row.lot.id}|${row.level}|${row.period.period}`;
          const earlier = summaryLines.get(key);
          if (earlier !== undefined) {
            rowErrors = [
              {
                row: line,
                column: null,
                code: 'duplicate_row',
                message: `line ${earlier} already gives ${row.procedure.code}, lot ${row.lot.lotNumber}, level ${row.level}, ${row.period.period}`,
              },
            ];
          } else {
            summaryLines.set(key, line);
            result.summaries.push(row);
          }
        }
      }

      if (rowErrors) {
        result.rowsRejected += 1;
        addErrors(rowErrors);
      } else {
        result.rowsAccepted += 1;
      }
    }
    await onFraction(upload.size > 0 ? bytesRead / upload.size : 0);
    const more = await batches.next();
    if (more.done) break;
    batch = more.value;
    next = 0;
  }
  if (result.rowsTotal === 0) {
    throw new FileFormatError({
      row: 2,
      column: null,
      code: 'required',
      message: 'The file has a header line but no data rows.',
    });
  }
  await onFraction(1);
  return result;
}

/** The text of a cell; '' for a column the file does not have or a short line. */
const cell = (cells: string[], index: number): string => (index >= 0 ? (cells[index] ?? '') : '');

/**
 * Which file column holds each canonical column: the mapping sent with the upload, else the lab's saved
 * mapping, else matching header names. A missing required column makes the whole file unreadable.
 */
function resolveColumns(
  upload: repo.UploadRecord,
  headers: string[],
  saved: Record<string, string> | null,
): { indexOf: Record<string, number>; headerOf: (canonical: string) => string | null } {
  const explicit =
    upload.columnMapping && Object.keys(upload.columnMapping).length ? upload.columnMapping : null;
  if (explicit) {
    const absent = Object.entries(explicit).filter(([, header]) => !headers.includes(header));
    if (absent.length) {
      throw new FileFormatError({
        row: 1,
        column: absent[0][1],
        code: 'missing_column',
        message:
          `The column mapping names ${absent.map(([c, h]) => `"${h}" (for ${c})`).join(', ')}, ` +
          `but the file's header has ${headers.map((h) => `"${h}"`).join(', ')}.`,
      });
    }
  }
  const suggestion = suggestMapping(upload.kind, headers, explicit ?? saved);
  if (suggestion.missing.length) {
    const first = suggestion.missing[0];
    throw new FileFormatError({
      row: 1,
      column: first,
      code: 'missing_column',
      message:
        `No column of the file holds ${suggestion.missing.map((m) => `"${m}"`).join(', ')}. ` +
        `The header has ${headers.map((h) => `"${h}"`).join(', ')}; map the columns and upload again.`,
    });
  }
  const indexOf: Record<string, number> = {};
  for (const column of canonicalColumns[upload.kind]) {
    const header = suggestion.mapping[column.name];
    if (header) indexOf[column.name] = headers.indexOf(header);
  }
  return { indexOf, headerOf: (canonical) => suggestion.mapping[canonical] ?? null };
}

/** A Drizzle handle per pooled connection, made once (making one walks the whole schema). */
const drizzleHandles = new WeakMap<pg.PoolClient, Database>();
function drizzleOn(client: pg.PoolClient): Database {
  let handle = drizzleHandles.get(client);
  if (!handle) {
    handle = dbOnClient(client);
    drizzleHandles.set(client, handle);
  }
  return handle;
}

/**
 * Writes the accepted rows, the upload's counts, its 'stored' status and the recompute requests in one
 * transaction: the file is stored whole or not at all. After the rows are in, the upload row is locked
 * and checked, so two runs of the same upload (a duplicate job, a stalled one retried) cannot both store
 * it, and an upload cancelled meanwhile stores nothing. (The row is not locked earlier: progress updates
 * from outside the transaction keep writing to it while the rows go in.)
 */
async function storeInOneTransaction(
  deps: IngestDeps,
  upload: repo.UploadRecord,
  read: ReadResult,
  counts: { rowsTotal: number; rowsAccepted: number; rowsRejected: number },
  onFraction: (fraction: number) => Promise<void>,
): Promise<boolean> {
  const client = await deps.pool.connect();
  let broken = false;
  // The pool listens for errors on idle connections only. A connection that dies while checked out
  // (PostgreSQL restarting mid-COPY: EPIPE, ECONNRESET) also fails the running statement, which is what
  // the job acts on; this listener only keeps the event from ending the process.
  const onConnectionError = (error: Error) => {
    broken = true;
    (deps.log ?? (() => {}))(`upload ${upload.id}: database connection lost: ${error.message}`);
  };
  client.on('error', onConnectionError);
  try {
    // No JIT compilation in this transaction: its statements touch a few rows each, but with statistics
    // lagging behind a burst of uploads the planner can price them above jit_above_cost, and compiling
    // then costs tens of milliseconds per statement.
    await client.query('begin; set local jit = off');
    const tx = drizzleOn(client);
    const ctx: StoreContext = {
      tx,
      client,
      upload: { id: upload.id, labId: upload.labId },
      actor: upload.uploadedBy
        ? { actorId: upload.uploadedBy, actorLabel: null }
        : { actorId: null, actorLabel: upload.tokenId ? `lab-token:${upload.tokenId}` : 'ingest-worker' },
    };
    const { replaced, targets } =
      upload.kind === 'qc-summary'
        ? await storeSummaries(ctx, read.summaries)
        : await storeValues(ctx, read.values, onFraction);

    // The update locks the upload row and re-checks it after any concurrent change has committed.
    const marked = await client.query(
      `update uploads set status = 'stored', stored_at = now(), progress = 1, rows_total = $2, rows_accepted = $3,
              rows_rejected = $4, errors = $5::jsonb, errors_total = $6, updated_at = now()
        where id = $1 and status = 'processing' and stored_at is null`,
      [
        upload.id,
        counts.rowsTotal,
        counts.rowsAccepted,
        counts.rowsRejected,
        JSON.stringify(read.errors),
        read.errorsTotal,
      ],
    );
    if (marked.rowCount !== 1) {
      await client.query('rollback');
      return false;
    }
    await recordAudit(tx, {
      kind: 'upload.stored',
      ...ctx.actor,
      labId: upload.labId,
      entity: 'upload',
      entityId: upload.id,
      details: { ...counts, replaced, confirmed: upload.confirmedAt !== null },
    });
    // Last before COMMIT: these rows are shared with the other uploads of the peer groups.
    await requestPeerStatistics(tx, targets);
    if (deps.holdBeforeCommitMs) await new Promise((resolve) => setTimeout(resolve, deps.holdBeforeCommitMs));
    await client.query('commit');
    return true;
  } catch (error) {
    await client.query('rollback').catch(() => {
      broken = true;
    });
    throw error;
  } finally {
    client.off('error', onConnectionError);
    client.release(broken);
  }
}
