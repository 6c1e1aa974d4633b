import { describe, expect, it } from 'vitest';
import { linearLeastSquares } from '../../src/fit/linearLeastSquares.js';
import { readStrd } from './strdFile.js';
import { linearRegression } from 'simple-statistics';

/** Number of matching significant digits, the log relative error used by the StRD papers (McCullough 1998). */
function digits(estimate: number, certified: number): number {
  if (estimate === certified) return 16;
  return -Math.log10(Math.abs(estimate - certified) / Math.abs(certified));
}

function designFromStrd(name: string, intercept: boolean): { columns: Float64Array[]; y: Float64Array } {
  const s = readStrd(name);
  const n = s.y.length;
  const p = s.x[0]!.length;
  const columns: Float64Array[] = [];
  if (intercept) columns.push(new Float64Array(n).fill(1));
  for (let j = 0; j < p; j++) columns.push(Float64Array.from(s.x, (row) => row[j]!));
  return { columns, y: Float64Array.from(s.y) };
}

describe('linearLeastSquares against the NIST StRD certified values', () => {
  // Reference: NIST StRD linear regression, Norris (lower difficulty): certified B0, B1, their SDs, residual SD.
  it('matches Norris to at least 9 significant digits', () => {
    const s = readStrd('Norris');
    const { columns, y } = designFromStrd('Norris', true);
    const fit = linearLeastSquares(columns, y);
    s.certified.forEach((c, j) => {
      expect(digits(fit.coefficients[j]!, c.value)).toBeGreaterThanOrEqual(9);
      expect(digits(fit.se[j]!, c.sd)).toBeGreaterThanOrEqual(9);
    });
    expect(digits(fit.residualSd, s.residualSd!)).toBeGreaterThanOrEqual(9);
    expect(digits(fit.rss, s.residualSumSquares!)).toBeGreaterThanOrEqual(9);
  });

  // Reference: NIST StRD linear regression, NoInt1 (average difficulty, model without intercept).
  it('matches NoInt1 (no intercept) to at least 9 significant digits', () => {
    const s = readStrd('NoInt1');
    const { columns, y } = designFromStrd('NoInt1', false);
    const fit = linearLeastSquares(columns, y);
    expect(digits(fit.coefficients[0]!, s.certified[0]!.value)).toBeGreaterThanOrEqual(9);
    expect(digits(fit.se[0]!, s.certified[0]!.sd)).toBeGreaterThanOrEqual(9);
    expect(digits(fit.residualSd, s.residualSd!)).toBeGreaterThanOrEqual(9);
  });

  // Reference: NIST StRD linear regression, Longley (higher difficulty, nearly collinear predictors).
  it('matches Longley to at least 7 significant digits', () => {
    const s = readStrd('Longley');
    const { columns, y } = designFromStrd('Longley', true);
    const fit = linearLeastSquares(columns, y);
    expect(s.certified).toHaveLength(7);
    s.certified.forEach((c, j) => {
      expect(digits(fit.coefficients[j]!, c.value)).toBeGreaterThanOrEqual(7);
      expect(digits(fit.se[j]!, c.sd)).toBeGreaterThanOrEqual(7);
    });
    expect(digits(fit.residualSd, s.residualSd!)).toBeGreaterThanOrEqual(7);
  });
});

describe('linearLeastSquares against simple-statistics', () => {
  // Reference: simple-statistics linearRegression (closed-form slope/intercept), a second independent implementation.
  it('agrees with simple-statistics on the Norris data', () => {
    const s = readStrd('Norris');
    const ref = linearRegression(s.x.map((row, i) => [row[0]!, s.y[i]!]));
    const { columns, y } = designFromStrd('Norris', true);
    const fit = linearLeastSquares(columns, y);
    expect(fit.coefficients[1]).toBeCloseTo(ref.m, 10);
    expect(fit.coefficients[0]).toBeCloseTo(ref.b, 9);
  });

  it('rejects a design whose columns are linearly dependent', () => {
    const t = Float64Array.from({ length: 20 }, (_, i) => i);
    expect(() => linearLeastSquares([t, Float64Array.from(t, (v) => 2 * v)], t)).toThrow(/depends linearly/);
  });
});
