// Locates the shared public reference data (../shared/reference-data from the repository root)
// and reads it at test time; tests that need it skip with a message when the folder is absent.
import { existsSync, readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

const repositoryRoot = resolve(fileURLToPath(new URL('.', import.meta.url)), '../../../..');
// REFERENCE_DATA_DIR overrides; otherwise ../shared/reference-data beside the checkout, then the
// workplace's shared folder (a clone elsewhere still finds it).
const candidates = [
  process.env.REFERENCE_DATA_DIR,
  resolve(repositoryRoot, '../shared/reference-data'),
  '/work/shared/reference-data',
].filter((p): p is string => Boolean(p));
export const referenceDataRoot = candidates.find((p) => existsSync(p)) ?? candidates[0];

/** Absolute path of a reference-data folder and whether it is present. */
export function referenceFolder(name: string): { path: string; present: boolean; skipReason: string } {
  const path = resolve(referenceDataRoot, name);
  const present = existsSync(path);
  return { path, present, skipReason: present ? '' : `(skipped: reference data folder ${path} is absent)` };
}

/** Values of a NIST StRD univariate dataset, one per line. */
export function readNistDataset(name: string): number[] {
  const text = readFileSync(resolve(referenceDataRoot, 'nist-strd', `${name}.dat`), 'utf8');
  return text
    .split('\n')
    .map((line) => line.trim())
    .filter((line) => line !== '')
    .map(Number);
}

/**
 * One NHANES 2017–2018 biochemistry column for adults (age ≥ 18, not pregnant), positive values only.
 * Source: CDC/NCHS, National Health and Nutrition Examination Survey Data, 2017–2018 (public domain).
 */
export function readNhanesAdults(column: string, sex?: 'male' | 'female'): number[] {
  const file = resolve(referenceDataRoot, 'nhanes-2017-2018-biopro', 'nhanes_2017_2018_biopro_demo.csv');
  const [header, ...rows] = readFileSync(file, 'utf8').trim().split('\n');
  const names = header.split(',');
  const at = (name: string) => {
    const index = names.indexOf(name);
    if (index < 0) throw new Error(`readNhanesAdults: column ${name} not found in ${file}`);
    return index;
  };
  const [value, age, pregnant, gender] = [at(column), at('RIDAGEYR'), at('RIDEXPRG'), at('RIAGENDR')];
  const wanted = sex === 'male' ? '1' : sex === 'female' ? '2' : null;
  const values: number[] = [];
  for (const row of rows) {
    const cells = row.split(',');
    if (Number(cells[age]) < 18 || cells[pregnant] === '1') continue;
    if (wanted && cells[gender] !== wanted) continue;
    if (cells[value] === '' || !(Number(cells[value]) > 0)) continue;
    values.push(Number(cells[value]));
  }
  return values;
}

/** Relative difference |actual − expected| / |expected|. */
export function relativeError(actual: number, expected: number): number {
  return Math.abs(actual - expected) / Math.abs(expected);
}
