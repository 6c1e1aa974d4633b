// The line a batch prints for a finished run shows its interval to two significant digits of the standard error, so
// a narrow interval is not rounded away ("141.3 (141.3 to 141.3)").
import { describe, expect, it } from 'vitest';
import { describeEvent } from '../../src/batch/batchDisplay.js';

const done = (rate: number, se: number, lo: number, hi: number) => describeEvent({ type: 'done', run: 'F12-a', elapsed_s: 4, model: 'steady', rate_deg_s: rate, se_deg_s: se, lo_deg_s: lo, hi_deg_s: hi });

describe('describeEvent', () => {
  it('shows a finished run\'s rate with as many decimals as two significant digits of its standard error need', () => {
    expect(done(141.3012, 0.0098, 141.2812, 141.3212)).toBe('F12-a: done in 4 s: steady, 141.3012 deg/s (141.2812 to 141.3212)');
    expect(done(-0.48, 0.21, -0.9, -0.06)).toBe('F12-a: done in 4 s: steady, -0.48 deg/s (-0.90 to -0.06)');
    expect(done(230.4, 6.2, 218, 243)).toBe('F12-a: done in 4 s: steady, 230.4 deg/s (218.0 to 243.0)');
  });
});
