import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { readAngleTable } from '../../src/fit/readAngleTable.js';
import { InputError } from '../../src/errors.js';

const dir = mkdtempSync(join(tmpdir(), 'revtrace-readangle-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function table(name: string, text: string): string {
  const p = join(dir, name);
  writeFileSync(p, text);
  return p;
}

function rows(n: number, make: (i: number) => string): string {
  return Array.from({ length: n }, (_, i) => make(i)).join('\n');
}

describe('readAngleTable', () => {
  it('reads t_s and angle_deg among other columns, with lost frames as empty cells', async () => {
    const p = table('ok.csv', `frame,t_s,x_px,angle_deg,flag\n${rows(12, (i) => `${i},${(i / 30).toFixed(4)},1,${i === 3 ? '' : 2 * i},${i === 3 ? 'lost:gate' : ''}`)}\n`);
    const r = await readAngleTable(p);
    expect(r.rows).toBe(12);
    expect(r.lost_rows).toBe(1);
    expect(r.lost_share).toBeCloseTo(1 / 12, 12);
    expect(Number.isNaN(r.angle_deg[3])).toBe(true);
    expect(r.angle_deg[4]).toBe(8);
    expect(r.t_s[11]).toBeCloseTo(11 / 30, 4);
  });

  it('reads a quoted CSV (through csv-parse) the same as a plain one', async () => {
    const body = rows(12, (i) => `${i / 30},${i === 2 ? '' : 0.5 * i}`);
    const plain = await readAngleTable(table('plain.csv', `t_s,angle_deg\n${body}\n`));
    const quoted = await readAngleTable(table('quoted.csv', `# exported by hand\n"t_s","angle_deg"\n${body.replace(/,/g, ',"').replace(/\n/g, '"\n')}"\n`));
    expect(Array.from(quoted.t_s)).toEqual(Array.from(plain.t_s));
    expect(Array.from(quoted.angle_deg)).toEqual(Array.from(plain.angle_deg));
    expect(quoted.lost_rows).toBe(1);
  });

  const bad: [string, string, RegExp][] = [
    ['missing column', `t_s,angle\n${rows(12, (i) => `${i},${i}`)}`, /no angle_deg column/],
    ['non-numeric cell', `t_s,angle_deg\n${rows(12, (i) => `${i},${i === 5 ? 'abc' : i}`)}`, /line 7: angle_deg "abc" is not a number/],
    ['unsorted times', `t_s,angle_deg\n${rows(12, (i) => `${i === 6 ? 2 : i},${i}`)}`, /must be sorted by increasing time/],
    ['repeated times', `t_s,angle_deg\n${rows(12, (i) => `${i === 6 ? 5 : i},${i}`)}`, /repeats the previous row/],
    ['too few rows', `t_s,angle_deg\n${rows(9, (i) => `${i},${i}`)}`, /9 valid rows but a fit needs at least 10/],
    ['empty file', '', /is empty/],
  ];
  for (const [what, text, message] of bad) {
    it(`rejects a table with ${what} in one sentence`, async () => {
      const p = table(`${what.replace(/ /g, '-')}.csv`, text);
      const err = await readAngleTable(p).catch((e: unknown) => e);
      expect(err).toBeInstanceOf(InputError);
      expect((err as Error).message).toMatch(message);
      expect((err as Error).message.split(/[.;] [A-Z]/).length).toBe(1);
    });
  }

  it('names a missing file', async () => {
    await expect(readAngleTable(join(dir, 'nope.csv'))).rejects.toThrow(/does not exist/);
  });
});
