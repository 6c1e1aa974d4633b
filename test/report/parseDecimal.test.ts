import { describe, expect, it } from 'vitest';
import { parseDecimal } from '../../src/report/parseDecimal.js';
import { seededRandom } from '../../src/synth/seededRandom.js';

const parse = (s: string) => parseDecimal(`x,${s},y`, 2, 2 + s.length);
// Reference: the JavaScript engine's own Number() (ECMAScript StringToNumber, correctly rounded).
const reference = (s: string) => {
  const v = Number(s.trim() === '' ? Number.NaN : s);
  return Number.isFinite(v) ? v : Number.NaN;
};

describe('parseDecimal', () => {
  it('gives bit-identical results to Number() on the numbers revtrace writes', () => {
    const rng = seededRandom(7, 3);
    for (let k = 0; k < 20_000; k++) {
      const magnitude = 10 ** Math.floor(rng.uniform() * 12 - 4);
      const v = (rng.uniform() - 0.5) * magnitude;
      for (const s of [v.toFixed(Math.floor(rng.uniform() * 8)), String(v), v.toPrecision(1 + Math.floor(rng.uniform() * 16))]) {
        expect(Object.is(parse(s), reference(s)), s).toBe(true);
      }
    }
  });

  it('handles signs, blanks, exponents and junk like Number()', () => {
    for (const s of ['0', '-0', '+3.5', '  12.25 ', '.5', '5.', '-.25', '1e3', '2.5E-7', '12345678901234567890', '0.1234567890123456789', 'NaN', 'Infinity', 'abc', '1.2.3', '', ' ', '-', '.']) {
      expect(Object.is(parse(s), reference(s)), JSON.stringify(s)).toBe(true);
    }
  });
});
