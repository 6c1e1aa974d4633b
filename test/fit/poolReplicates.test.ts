import { describe, expect, it } from 'vitest';
import jstatModule from 'jstat';
import { poolReplicates } from '../../src/fit/poolReplicates.js';
import type { RateEstimate } from '../../src/fit/compareDirections.js';

const { jStat } = jstatModule;

// Thirteen BCG vaccine trials (Colditz et al. 1994), as distributed with the R package metafor (dat.bcg):
// [vaccinated TB+, vaccinated TB−, control TB+, control TB−]. Data and results below are quoted from memory.
const bcg: [number, number, number, number][] = [
  [4, 119, 11, 128], [6, 300, 29, 274], [3, 228, 11, 209], [62, 13536, 248, 12619], [33, 5036, 47, 5761],
  [180, 1361, 372, 1079], [8, 2537, 10, 619], [505, 87886, 499, 87892], [29, 7470, 45, 7232],
  [17, 1699, 65, 1600], [186, 50448, 141, 27197], [5, 2493, 3, 2338], [27, 16886, 29, 17825],
];

/** Log risk ratios and their sampling variances (the usual escalc "RR" formulas). */
function bcgEstimates(): RateEstimate[] {
  return bcg.map(([a, b, c, d]) => ({
    value_deg_s: Math.log(a / (a + b) / (c / (c + d))),
    se_deg_s: Math.sqrt(1 / a - 1 / (a + b) + 1 / c - 1 / (c + d)),
    df: Infinity,
  }));
}

describe('poolReplicates (DerSimonian–Laird random effects)', () => {
  // Reference (from memory): metafor rma(yi, vi, data = dat.bcg, method = "DL") reports
  // Q(df = 12) = 152.2330, tau^2 = 0.3088, estimate = -0.7141, se = 0.1787.
  it('reproduces the DerSimonian–Laird analysis of the BCG trials', () => {
    const p = poolReplicates(bcgEstimates());
    expect(p.k).toBe(13);
    expect(p.q).toBeCloseTo(152.233, 3);
    expect(p.tau2_deg2_s2).toBeCloseTo(0.3088, 4);
    expect(p.value_deg_s).toBeCloseTo(-0.7141, 4);
    expect(p.se_dl_deg_s).toBeCloseTo(0.1787, 4);
    expect(p.df).toBe(12);
  });

  // Reference: Hartung & Knapp (2001) / Sidik & Jonkman (2002) variance, written out here independently
  // (the formulas of metafor's test = "knha"), with the Röver et al. (2015) floor max(1, q).
  it('matches an independent Hartung–Knapp computation on scattered replicates', () => {
    const est: RateEstimate[] = [
      { value_deg_s: 12.1, se_deg_s: 0.3, df: 40 },
      { value_deg_s: 13.4, se_deg_s: 0.5, df: 40 },
      { value_deg_s: 11.2, se_deg_s: 0.4, df: 40 },
      { value_deg_s: 12.9, se_deg_s: 0.25, df: 40 },
    ];
    const v = est.map((e) => e.se_deg_s ** 2);
    const y = est.map((e) => e.value_deg_s);
    const w = v.map((x) => 1 / x);
    const sum = (a: number[]) => a.reduce((s, x) => s + x, 0);
    const yFixed = sum(w.map((wi, i) => wi * y[i]!)) / sum(w);
    const Q = sum(w.map((wi, i) => wi * (y[i]! - yFixed) ** 2));
    const C = sum(w) - sum(w.map((x) => x * x)) / sum(w);
    const tau2 = Math.max(0, (Q - 3) / C);
    const ws = v.map((x) => 1 / (x + tau2));
    const mu = sum(ws.map((wi, i) => wi * y[i]!)) / sum(ws);
    const qhk = sum(ws.map((wi, i) => wi * (y[i]! - mu) ** 2)) / 3;
    const se = Math.sqrt(Math.max(1, qhk) / sum(ws));
    const t = jStat.studentt.inv(0.975, 3);
    const p = poolReplicates(est);
    expect(p.tau2_deg2_s2).toBeGreaterThan(0);
    expect(p.tau2_deg2_s2).toBeCloseTo(tau2, 10);
    expect(p.value_deg_s).toBeCloseTo(mu, 10);
    expect(p.se_deg_s).toBeCloseTo(se, 10);
    expect(p.ci_deg_s[0]).toBeCloseTo(mu - t * se, 10);
    expect(p.ci_deg_s[1]).toBeCloseTo(mu + t * se, 10);
  });

  it('finds no between-run variance when replicates agree better than their errors say', () => {
    const p = poolReplicates([
      { value_deg_s: -0.50, se_deg_s: 0.2, df: 30 },
      { value_deg_s: -0.52, se_deg_s: 0.2, df: 30 },
      { value_deg_s: -0.49, se_deg_s: 0.2, df: 30 },
    ]);
    expect(p.tau2_deg2_s2).toBe(0);
    // with τ² = 0 and q < 1 the floor keeps the inverse-variance standard error 0.2/√3
    expect(p.se_deg_s).toBeCloseTo(0.2 / Math.sqrt(3), 12);
    expect(p.value_deg_s).toBeCloseTo(-0.503333333333, 10);
  });

  it('passes a single run through with its own t interval', () => {
    const p = poolReplicates([{ value_deg_s: 3, se_deg_s: 0.5, df: 10 }]);
    expect(p.value_deg_s).toBe(3);
    // t(0.975, 10) = 2.228 (Student t table)
    expect(p.ci_deg_s[1]).toBeCloseTo(3 + 2.228 * 0.5, 3);
    expect(Number.isNaN(p.tau2_deg2_s2)).toBe(true);
    expect(p.method).toMatch(/Single run/);
  });

  it('rejects an estimate without a standard error', () => {
    expect(() => poolReplicates([{ value_deg_s: 1, se_deg_s: 0, df: 5 }])).toThrow(/standard error/);
    expect(() => poolReplicates([])).toThrow(/at least one run/);
  });
});
