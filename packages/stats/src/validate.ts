// Shared input checks. Every message starts with the function name so a caller can tell
// which computation refused its input and why.

/** Throws an Error whose message names the function and the problem. */
export function fail(fn: string, problem: string): never {
  throw new Error(`${fn}: ${problem}`);
}

/**
 * Checks that `values` is an array of at least `min` finite numbers. `suffix` places the values,
 * e.g. " in the first group"; `noun` is the plural and singular used in messages.
 */
export function checkValues(
  fn: string,
  values: readonly number[],
  min: number,
  suffix = '',
  noun: [string, string] = ['values', 'value'],
): void {
  if (!Array.isArray(values)) fail(fn, `${noun[0]}${suffix} must be an array of numbers`);
  if (values.length < min) fail(fn, `needs at least ${min} ${noun[0]}${suffix}, got ${values.length}`);
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (typeof v !== 'number' || !Number.isFinite(v)) {
      fail(fn, `${noun[1]} at index ${i}${suffix} is not a finite number (${String(v)})`);
    }
  }
}

/** Checks that a named input is a finite number. */
export function checkFinite(fn: string, name: string, value: number): void {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    fail(fn, `${name} must be a finite number, got ${String(value)}`);
  }
}

/** Checks that a named input is a finite number greater than zero. */
export function checkPositive(fn: string, name: string, value: number): void {
  checkFinite(fn, name, value);
  if (value <= 0) fail(fn, `${name} must be greater than 0, got ${value}`);
}

/** Checks that a named input is a probability strictly between 0 and 1. */
export function checkProbability(fn: string, name: string, value: number): void {
  checkFinite(fn, name, value);
  if (value <= 0 || value >= 1) fail(fn, `${name} must be between 0 and 1 (exclusive), got ${value}`);
}

/** Checks that a named input is an integer of at least `min`. */
export function checkInteger(fn: string, name: string, value: number, min: number): void {
  if (typeof value !== 'number' || !Number.isInteger(value) || value < min) {
    fail(fn, `${name} must be an integer of at least ${min}, got ${String(value)}`);
  }
}

/** Copies finite values into a new Float64Array sorted ascending (typed-array sort is numeric). */
export function sortedCopy(fn: string, values: readonly number[], min: number): Float64Array {
  checkValues(fn, values, min);
  return new Float64Array(values).sort();
}

/** Median of an ascending-sorted array. */
export function medianOfSorted(sorted: ArrayLike<number>): number {
  const n = sorted.length;
  const mid = n >> 1;
  return n % 2 === 1 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
}
