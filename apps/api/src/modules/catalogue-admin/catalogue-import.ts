import { parse } from 'csv-parse/sync';
import type { z } from 'zod';
import { recordAudit, type Database, type Executor } from '@plumbline/db';
import {
  catalogueCsvColumns,
  controlLotCreateSchema,
  type CatalogueList,
  type FieldError,
  type ImportResult,
  type ImportRow,
} from '@plumbline/contracts';
import { actorOf, type Principal } from '../../auth/principal.ts';
import { badRequest, validationFailed } from '../../errors/app-error.ts';
import { simpleListSpecs, type CatalogueRecord, type SimpleListSpec } from './catalogue-lists.ts';
import {
  findLotRowsByNumber,
  findMaterialsByCode,
  findSimpleRowsByCode,
  insertLot,
  insertSimpleRow,
  updateLot,
  updateSimpleRow,
  type LotRow,
  type LotValues,
} from './catalogue-admin.repository.ts';
import {
  UNIT_LOCKED_MESSAGE,
  changesBetween,
  droppedLevelsWithData,
  editedSimpleValues,
  isSimpleList,
  newSimpleValues,
  normaliseLevels,
  writeOrConflict,
} from './catalogue-admin.service.ts';

type CsvRecord = { line: number; cells: Record<string, string> };
type CellError = { column: string; message: string };

/** Parses the file into records keyed by (lower-cased) header; malformed CSV or headers give 400. */
function readCsv(text: string, list: CatalogueList): { header: string[]; records: CsvRecord[] } {
  let parsed: Array<{ record: string[]; info: { lines: number } }>;
  try {
    parsed = parse(text, {
      bom: true,
      info: true,
      trim: true,
      skip_empty_lines: true,
      relax_column_count: true,
    }) as unknown as Array<{ record: string[]; info: { lines: number } }>;
  } catch (err) {
    const message = err instanceof Error ? err.message : String(err);
    throw badRequest(`The CSV file could not be read: ${message}`);
  }
  if (parsed.length === 0)
    throw badRequest('The CSV file is empty: expected a header row and at least one data row.');
  const header = parsed[0].record.map((h) => h.trim().toLowerCase());
  const { required, optional } = catalogueCsvColumns[list];
  const known: readonly string[] = [...required, ...optional];
  const problems: FieldError[] = [];
  for (const column of header) {
    if (!known.includes(column))
      problems.push({ path: 'header', message: `unknown column "${column}"; expected ${known.join(', ')}` });
  }
  for (const column of required) {
    if (!header.includes(column))
      problems.push({ path: 'header', message: `missing required column "${column}"` });
  }
  const duplicates = header.filter((h, i) => header.indexOf(h) !== i);
  for (const column of new Set(duplicates))
    problems.push({ path: 'header', message: `column "${column}" appears twice` });
  if (problems.length)
    throw badRequest(`The CSV header is not valid: ${problems.map((p) => p.message).join('; ')}`, problems);
  if (parsed.length === 1) throw badRequest('The CSV file has a header but no data rows.');

  const records = parsed.slice(1).map(({ record, info }) => {
    const cells: Record<string, string> = {};
    header.forEach((column, i) => (cells[column] = record[i] ?? ''));
    if (record.length !== header.length) cells['#count'] = String(record.length);
    return { line: info.lines, cells };
  });
  return { header, records };
}

/** Maps contract issues (paths in field names) back to CSV column names. */
function issuesToCells(error: z.ZodError, fieldToColumn: Record<string, string>): CellError[] {
  return error.issues.map((issue) => {
    const field = String(issue.path[0] ?? '');
    return { column: fieldToColumn[field] ?? (field || 'row'), message: issue.message };
  });
}

const fieldErrorsToCells = (errors: FieldError[], fieldToColumn: Record<string, string>): CellError[] =>
  errors.map((e) => ({ column: fieldToColumn[e.path.split('.')[0]] ?? e.path, message: e.message }));

function cellCountError(record: CsvRecord, header: string[]): CellError[] {
  const count = record.cells['#count'];
  return count === undefined
    ? []
    : [{ column: 'row', message: `expected ${header.length} cells, found ${count}` }];
}

/** Marks the second and later rows that use a key already used higher up in the file. */
function duplicateKeyErrors(keys: string[], records: CsvRecord[], keyColumn: string): Map<number, CellError> {
  const firstLine = new Map<string, number>();
  const errors = new Map<number, CellError>();
  keys.forEach((key, i) => {
    if (!key) return;
    const seen = firstLine.get(key);
    if (seen !== undefined)
      errors.set(i, { column: keyColumn, message: `"${key}" is also on row ${seen} of this file` });
    else firstLine.set(key, records[i].line);
  });
  return errors;
}

type PlannedRow = ImportRow & { apply?: (tx: Executor) => Promise<void> };

// ---------- analytes, methods, instrument models, reagents, control materials ----------

async function planSimpleRows(
  db: Database,
  principal: Principal,
  spec: SimpleListSpec,
  header: string[],
  records: CsvRecord[],
): Promise<PlannedRow[]> {
  const fieldToColumn = Object.fromEntries(
    Object.entries(spec.csvColumns).map(([column, field]) => [field, column]),
  );
  const keys = records.map((r) => r.cells.code ?? '');
  const existingByCode = await findSimpleRowsByCode(db, spec, [...new Set(keys.filter(Boolean))]);
  const duplicates = duplicateKeyErrors(keys, records, 'code');
  const planned: PlannedRow[] = [];

  for (const [i, record] of records.entries()) {
    const errors: CellError[] = [...cellCountError(record, header)];
    const duplicate = duplicates.get(i);
    if (duplicate) errors.push(duplicate);
    // Only the columns the file has are read: on update, a missing column leaves the field as it is.
    const input: CatalogueRecord = {};
    for (const column of header) {
      const field = spec.csvColumns[column];
      const cell = record.cells[column];
      if (cell === '' && spec.blankNotGivenColumns?.includes(column)) continue;
      if (!spec.numericColumns.includes(column)) {
        input[field] = cell;
        continue;
      }
      if (cell === '') {
        input[field] = null;
        continue;
      }
      const value = Number(cell);
      if (Number.isFinite(value)) input[field] = value;
      else errors.push({ column, message: `"${cell}" is not a number` });
    }
    const existing = existingByCode.get(keys[i]);
    const schema = existing ? spec.updateSchema : spec.createSchema;
    const parsed = errors.length === 0 ? schema.safeParse(input) : null;
    if (parsed && !parsed.success) errors.push(...issuesToCells(parsed.error, fieldToColumn));
    if (errors.length || !parsed?.success) {
      planned.push({ row: record.line, action: 'error', errors });
      continue;
    }
    const data = parsed.data as CatalogueRecord;

    if (!existing) {
      const { values, errors: checkErrors } = newSimpleValues(spec, data);
      if (checkErrors.length) {
        planned.push({
          row: record.line,
          action: 'error',
          errors: fieldErrorsToCells(checkErrors, fieldToColumn),
        });
        continue;
      }
      planned.push({
        row: record.line,
        action: 'create',
        data: values,
        apply: async (tx) => {
          const created = await insertSimpleRow(tx, spec, values);
          await recordAudit(tx, {
            ...actorOf(principal),
            kind: `catalogue.${spec.entity}.create`,
            entity: spec.entity,
            entityId: created.id as string,
            details: { values, via: 'csv-import', row: record.line },
          });
        },
      });
      continue;
    }

    const edit = await editedSimpleValues(db, spec, existing, data);
    const editErrors = fieldErrorsToCells(edit.errors, fieldToColumn);
    if (edit.unitLocked) editErrors.push({ column: 'unit', message: UNIT_LOCKED_MESSAGE });
    if (editErrors.length) {
      planned.push({ row: record.line, action: 'error', errors: editErrors });
      continue;
    }
    const id = existing.id as string;
    planned.push({
      row: record.line,
      action: 'update',
      data: {
        id,
        ...Object.fromEntries(
          spec.fields.map((f) => [f, f in edit.values ? edit.values[f] : (existing[f] ?? null)]),
        ),
      },
      changes: Object.keys(edit.changes),
      apply: async (tx) => {
        if (Object.keys(edit.changes).length === 0) return;
        await updateSimpleRow(tx, spec, id, edit.values);
        await recordAudit(tx, {
          ...actorOf(principal),
          kind: `catalogue.${spec.entity}.update`,
          entity: spec.entity,
          entityId: id,
          details: { code: existing.code, changes: edit.changes, via: 'csv-import', row: record.line },
        });
      },
    });
  }
  return planned;
}

// ---------- control lots ----------

/** The lot's own fields; the material comes from its code column. */
const lotCsvFieldsSchema = controlLotCreateSchema.omit({ materialId: true, reason: true });

const lotFieldToColumn: Record<string, string> = {
  lotNumber: 'lot_number',
  materialId: 'material_code',
  expiresOn: 'expires_on',
  levels: 'levels',
};

/** "1;2;3" with optional "normal;high;low" → level list; descriptions absent keep what the lot had. */
function parseLevels(
  levelsCell: string,
  descriptionsCell: string | undefined,
  existing: LotRow | undefined,
): { levels?: Array<{ level: number; description: string | null }>; errors: CellError[] } {
  const errors: CellError[] = [];
  const parts = levelsCell.split(';').map((p) => p.trim());
  if (levelsCell.trim() === '')
    return { errors: [{ column: 'levels', message: 'list the levels, e.g. 1;2;3' }] };
  const numbers: number[] = [];
  for (const part of parts) {
    if (!/^\d+$/.test(part))
      errors.push({ column: 'levels', message: `"${part}" is not a whole level number` });
    else numbers.push(Number(part));
  }
  let descriptions: Array<string | null>;
  if (descriptionsCell === undefined) {
    const previous = new Map(existing?.levels.map((l) => [l.level, l.description]) ?? []);
    descriptions = numbers.map((n) => previous.get(n) ?? null);
  } else if (descriptionsCell.trim() === '') {
    descriptions = numbers.map(() => null);
  } else {
    const cells = descriptionsCell.split(';').map((d) => d.trim());
    if (cells.length !== parts.length) {
      errors.push({
        column: 'level_descriptions',
        message: `gives ${cells.length} descriptions for ${parts.length} levels; separate them with ";" in the same order`,
      });
    }
    descriptions = cells.map((d) => d || null);
  }
  if (errors.length) return { errors };
  return { levels: numbers.map((level, i) => ({ level, description: descriptions[i] ?? null })), errors };
}

async function planLotRows(
  db: Database,
  principal: Principal,
  header: string[],
  records: CsvRecord[],
): Promise<PlannedRow[]> {
  const keys = records.map((r) => r.cells.lot_number ?? '');
  const existingByNumber = await findLotRowsByNumber(db, [...new Set(keys.filter(Boolean))]);
  const materials = await findMaterialsByCode(db, [
    ...new Set(records.map((r) => r.cells.material_code).filter(Boolean)),
  ]);
  const duplicates = duplicateKeyErrors(keys, records, 'lot_number');
  const planned: PlannedRow[] = [];

  for (const [i, record] of records.entries()) {
    const errors: CellError[] = [...cellCountError(record, header)];
    const duplicate = duplicates.get(i);
    if (duplicate) errors.push(duplicate);
    const existing = existingByNumber.get(keys[i]);
    const materialCode = record.cells.material_code;
    const material = materials.get(materialCode);
    if (!materialCode) errors.push({ column: 'material_code', message: 'give the control material code' });
    else if (!material)
      errors.push({ column: 'material_code', message: `no control material has the code "${materialCode}"` });
    else if (material.retiredAt && material.id !== existing?.material.id) {
      errors.push({ column: 'material_code', message: `the control material "${materialCode}" is retired` });
    }
    const levels = parseLevels(record.cells.levels, record.cells.level_descriptions, existing);
    errors.push(...levels.errors);
    const parsed = lotCsvFieldsSchema.safeParse({
      lotNumber: record.cells.lot_number,
      expiresOn: record.cells.expires_on,
      levels: levels.levels ?? [],
    });
    if (!parsed.success) {
      // A levels cell that could not be read already has its own error.
      const issues = issuesToCells(parsed.error, lotFieldToColumn);
      errors.push(...issues.filter((e) => e.column !== 'levels' || levels.errors.length === 0));
    }
    if (errors.length || !parsed.success || !material) {
      planned.push({ row: record.line, action: 'error', errors });
      continue;
    }
    const values: LotValues = {
      materialId: material.id,
      lotNumber: parsed.data.lotNumber,
      expiresOn: parsed.data.expiresOn,
      levels: normaliseLevels(parsed.data.levels),
    };
    const data = { ...values, materialCode };

    if (!existing) {
      planned.push({
        row: record.line,
        action: 'create',
        data,
        apply: async (tx) => {
          const id = await insertLot(tx, values);
          await recordAudit(tx, {
            ...actorOf(principal),
            kind: 'catalogue.control-lot.create',
            entity: 'control-lot',
            entityId: id,
            details: { values, via: 'csv-import', row: record.line },
          });
        },
      });
      continue;
    }

    const current: LotValues = {
      materialId: existing.material.id,
      lotNumber: existing.lotNumber,
      expiresOn: existing.expiresOn,
      levels: existing.levels,
    };
    const changes = changesBetween(current, values);
    const dropped = await droppedLevelsWithData(db, existing, values.levels);
    if (dropped.length) {
      planned.push({
        row: record.line,
        action: 'error',
        errors: [
          {
            column: 'levels',
            message: `levels ${dropped.join(', ')} already have QC data and cannot be removed`,
          },
        ],
      });
      continue;
    }
    planned.push({
      row: record.line,
      action: 'update',
      data: { id: existing.id, ...data },
      changes: Object.keys(changes),
      apply: async (tx) => {
        if (Object.keys(changes).length === 0) return;
        await updateLot(tx, existing.id, values);
        await recordAudit(tx, {
          ...actorOf(principal),
          kind: 'catalogue.control-lot.update',
          entity: 'control-lot',
          entityId: existing.id,
          details: { lotNumber: existing.lotNumber, changes, via: 'csv-import', row: record.line },
        });
      },
    });
  }
  return planned;
}

// ---------- entry point ----------

/**
 * Previews (dryRun) or applies a CSV import of one catalogue list. Each row either creates an entry
 * (its key is new), updates one (its key exists) or is rejected with cell-level errors. Applying
 * happens only when no row is rejected, all in one transaction: never a partial load.
 */
export async function importCatalogueCsv(
  db: Database,
  principal: Principal,
  list: CatalogueList,
  text: string,
  dryRun: boolean,
): Promise<ImportResult> {
  const { header, records } = readCsv(text, list);
  const planned = isSimpleList(list)
    ? await planSimpleRows(db, principal, simpleListSpecs[list], header, records)
    : await planLotRows(db, principal, header, records);
  const rows: ImportRow[] = planned.map(({ apply: _apply, ...row }) => row);
  const summary = {
    rows,
    created: rows.filter((r) => r.action === 'create').length,
    updated: rows.filter((r) => r.action === 'update').length,
    rejected: rows.filter((r) => r.action === 'error').length,
  };
  if (dryRun) return { ...summary, applied: false };
  if (summary.rejected > 0) {
    throw validationFailed(
      `${summary.rejected} of ${rows.length} rows have errors, so nothing was imported. Fix them and import again.`,
      { ...summary, applied: false },
    );
  }
  await writeOrConflict(
    db,
    'Another change to this list was saved while the import ran; preview the file again.',
    async (tx) => {
      for (const row of planned) await row.apply?.(tx);
    },
  );
  return { ...summary, applied: true };
}
