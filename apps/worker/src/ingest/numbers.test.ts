import { describe, expect, it } from 'vitest';
import { parseDecimal, parseWholeNumber } from './numbers.ts';

describe('parseDecimal', () => {
  it('when the cell uses a decimal point, then it is read in any file', () => {
    expect(parseDecimal(' 5.43 ', false)).toBe(5.43);
    expect(parseDecimal('-0.5', false)).toBe(-0.5);
    expect(parseDecimal('.5', false)).toBe(0.5);
    expect(parseDecimal('1.2e3', false)).toBe(1200);
  });

  it('when the cell uses a decimal comma, then it is read only where decimal commas are allowed', () => {
    expect(parseDecimal('5,43', true)).toBe(5.43);
    expect(parseDecimal('5,43', false)).toBeNull();
  });

  it('when the cell has thousands separators or text, then it is refused rather than guessed', () => {
    expect(parseDecimal('1,234.5', true)).toBeNull();
    expect(parseDecimal('1 234', true)).toBeNull();
    expect(parseDecimal('5.4 mmol/L', false)).toBeNull();
    expect(parseDecimal('', false)).toBeNull();
    expect(parseDecimal('NaN', false)).toBeNull();
    expect(parseDecimal('Infinity', false)).toBeNull();
  });
});

describe('parseWholeNumber', () => {
  it('when the cell is a whole number, then it is read; decimals are refused', () => {
    expect(parseWholeNumber(' 20 ')).toBe(20);
    expect(parseWholeNumber('2.0')).toBeNull();
    expect(parseWholeNumber('two')).toBeNull();
  });
});
