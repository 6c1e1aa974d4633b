import { describe, expect, it } from 'vitest';
import { mkdir, mkdtemp, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parseManifest } from '../../src/batch/parseManifest.js';
import { ManifestError } from '../../src/batch/ManifestError.js';
import { trackOptionsFor } from '../../src/batch/processRun.js';
import type { RunJob } from '../../src/batch/RunJob.js';

/** A folder with clips/a.mp4 and clips/b.mp4 (placeholder files: validation only checks they exist). */
async function folder(): Promise<string> {
  const dir = await mkdtemp(join(tmpdir(), 'revtrace-manifest-'));
  await mkdir(join(dir, 'clips'));
  await writeFile(join(dir, 'clips', 'a.mp4'), 'a');
  await writeFile(join(dir, 'clips', 'b.mp4'), 'b');
  return dir;
}

async function problemsOf(csv: string, defaults?: string): Promise<string[]> {
  const dir = await folder();
  await writeFile(join(dir, 'day.csv'), csv);
  if (defaults !== undefined) await writeFile(join(dir, 'day.defaults.json'), defaults);
  try {
    await parseManifest(join(dir, 'day.csv'));
  } catch (err) {
    expect(err).toBeInstanceOf(ManifestError);
    const e = err as ManifestError;
    expect(e.exitCode).toBe(2);
    return e.message.split('\n').slice(1).map((l) => l.trim());
  }
  throw new Error('the manifest was accepted');
}

describe('parseManifest', () => {
  it('reads rows with paths relative to the manifest, defaults from the file beside it, and per-row overrides', async () => {
    const dir = await folder();
    await writeFile(join(dir, 'day.csv'), [
      'video,run,direction,setting,setting_unit,notes,roi,model',
      'clips/a.mp4,fwd-1,forward,1.5,m,first,,',
      '# a comment line',
      'clips/b.mp4,rev-1,Reverse,2,,"pump at 2, valve open","10,20,300,200",steady',
    ].join('\n'));
    await writeFile(join(dir, 'day.defaults.json'), JSON.stringify({ marker: 'dark', model: 'auto', roi: '0 0 640 480', margin: 0.5, setting_unit: 'bar' }));
    const m = await parseManifest(join(dir, 'day.csv'));
    expect(m.name).toBe('day');
    expect(m.defaults_path).toBe(join(dir, 'day.defaults.json'));
    expect(m.runs.map((r) => [r.run, r.row, r.line, r.direction, r.setting, r.setting_unit])).toEqual([
      ['fwd-1', 1, 2, 'forward', 1.5, 'm'],
      ['rev-1', 2, 4, 'reverse', 2, 'bar'],
    ]);
    expect(m.runs[0]!.video_abs).toBe(join(dir, 'clips', 'a.mp4'));
    expect(m.runs[0]!.settings.track).toMatchObject({ marker: 'dark', roi: { x: 0, y: 0, w: 640, h: 480 } });
    expect(m.runs[0]!.settings.fit).toMatchObject({ model: 'auto', margin_deg_s: 0.5, level: 0.95 });
    expect(m.runs[1]!.settings.track.roi).toEqual({ x: 10, y: 20, w: 300, h: 200 });
    expect(m.runs[1]!.settings.fit.model).toBe('steady');
    expect(m.runs[1]!.notes).toBe('pump at 2, valve open');
  });

  it('lists every problem of every row with its line and column', async () => {
    const problems = await problemsOf([
      'video,run,direction,setting,roi,center,from,to',
      'clips/missing.mp4,fwd-1,forward,1,,,,',
      'clips/a.mp4,fwd-2,sideways,1,,,,',
      'clips/a.mp4,fwd-1,forward,1,,,,',
      'clips/a.mp4,FWD-2,forward,1,,,,',
      'clips/a.mp4,r3,reverse,1.5 bar,"10,20,300",,,',
      'clips/a.mp4,../../etc,reverse,,,,,',
      'clips/a.mp4,runs/x,reverse,,,,,',
      'clips/a.mp4,.hidden,reverse,,,"12;x",,',
      'clips/a.mp4,r9,reverse,,,,5,2',
      'clips/b.mp4,r10,forward',
    ].join('\n'));
    expect(problems).toEqual([
      expect.stringMatching(/^day\.csv, line 2, column 1 "video": the video file clips\/missing\.mp4 does not exist/),
      expect.stringMatching(/^day\.csv, line 3, column 3 "direction": the direction "sideways" is unknown; write forward or reverse$/),
      expect.stringMatching(/^day\.csv, line 4, column 2 "run": the run id "fwd-1" repeats line 2/),
      expect.stringMatching(/^day\.csv, line 5, column 2 "run": the run id "FWD-2" repeats line 3/),
      expect.stringMatching(/^day\.csv, line 6, column 4 "setting": the setting "1\.5 bar" is not a number/),
      expect.stringMatching(/^day\.csv, line 6, column 5 "roi": roi "10,20,300" is not a region; write x,y,w,h/),
      expect.stringMatching(/^day\.csv, line 7, column 2 "run": the run id "\.\.\/\.\.\/etc" would leave the output folder/),
      expect.stringMatching(/^day\.csv, line 8, column 2 "run": the run id "runs\/x" would leave the output folder/),
      expect.stringMatching(/^day\.csv, line 9, column 2 "run": the run id "\.hidden" is not safe as a folder name/),
      expect.stringMatching(/^day\.csv, line 9, column 6 "center": center "12;x" is not a point/),
      expect.stringMatching(/^day\.csv, line 10, column 8 "to": to \(2 s\) is not after from \(5 s\)/),
      expect.stringMatching(/^day\.csv, line 11: has 3 fields but the header has 8; quote cells that contain commas/),
    ]);
  });

  it('lists a window that ends before it starts beside the row\'s other problems', async () => {
    const problems = await problemsOf('video,run,direction,roi,from,to\nclips/a.mp4,a,sideways,"1,2",5,2\n');
    expect(problems).toEqual([
      expect.stringMatching(/^day\.csv, line 2, column 3 "direction": the direction "sideways" is unknown/),
      expect.stringMatching(/^day\.csv, line 2, column 4 "roi": roi "1,2" is not a region/),
      expect.stringMatching(/^day\.csv, line 2, column 6 "to": to \(2 s\) is not after from \(5 s\)/),
    ]);
  });

  it('refuses one clip listed twice with the same settings (it would be pooled as two replicates), but not two windows of one clip', async () => {
    const problems = await problemsOf('video,run,direction\nclips/a.mp4,F1,forward\nclips/b.mp4,F2,forward\nclips/a.mp4,F3,forward\n');
    expect(problems).toEqual([
      'day.csv, line 4, column 1 "video": the video clips/a.mp4 is also run on line 2 with the same settings, so one clip would count as two replicates; remove one row, or give each its own window (from, to)',
    ]);
    const dir = await folder();
    await writeFile(join(dir, 'day.csv'), 'video,run,direction,from,to\nclips/a.mp4,up,forward,0,4\nclips/a.mp4,steady,forward,4,\n');
    expect((await parseManifest(join(dir, 'day.csv'))).runs.map((r) => r.run)).toEqual(['up', 'steady']);
  });

  it('reads a defaults file saved with a byte-order mark, and names the defaults file when the problem is there', async () => {
    const dir = await folder();
    await writeFile(join(dir, 'day.csv'), 'video,run,direction\nclips/a.mp4,a,forward\n');
    await writeFile(join(dir, 'day.defaults.json'), '\uFEFF{"model": "steady"}\r\n');
    expect((await parseManifest(join(dir, 'day.csv'))).runs[0]!.settings.fit.model).toBe('steady');
    await writeFile(join(dir, 'day.defaults.json'), '{"model": "sideways"}');
    const err = await parseManifest(join(dir, 'day.csv')).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(ManifestError);
    expect((err as Error).message.split('\n')[0]).toBe('the defaults file day.defaults.json has 1 problem; fix it and run again (nothing was run):');
  });

  it('names a semicolon-separated file as such, and ignores the empty columns a spreadsheet adds unless they hold values', async () => {
    expect(await problemsOf('video;run;direction\nclips/a.mp4;a;forward\n')).toEqual([
      'day.csv, line 1: separates its columns with semicolons (as spreadsheets set to a language with decimal commas save CSV); save it with commas, e.g. video,run,direction',
    ]);
    expect(await problemsOf('Video ,Run , Direction ,,,\nclips/a.mp4,a,forward,,,\nclips/b.mp4,b,reverse,,x,\n')).toEqual([
      'day.csv, line 3, column 5: holds "x" but the column has no name in the header; name the column or delete the value',
    ]);
    const dir = await folder();
    await writeFile(join(dir, 'day.csv'), 'Video ,Run , Direction ,,,\r\nclips/a.mp4,a,forward,,,\r\n');
    expect((await parseManifest(join(dir, 'day.csv'))).runs.map((r) => r.run)).toEqual(['a']);
  });

  it('says to write / when a missing video\'s path has Windows backslashes', async () => {
    expect(await problemsOf('video,run,direction\nclips\\a.mp4,a,forward\n')).toEqual([
      expect.stringMatching(/^day\.csv, line 2, column 1 "video": the video file clips\\a\.mp4 does not exist \(looked for .*\); check the path, relative to the manifest \(write \/ between folders, not \\\)$/),
    ]);
  });

  it('names a missing required column and an unknown column in the header', async () => {
    const problems = await problemsOf('video,run,diretion\nclips/a.mp4,fwd-1,forward\n');
    expect(problems).toEqual([
      expect.stringMatching(/^day\.csv, line 1, column 3 "diretion": is not a known column; the columns are video, run, direction, /),
      expect.stringMatching(/^day\.csv, line 1, "direction": the required column "direction" is missing from the header/),
    ]);
  });

  it('rejects unknown marker and model names, and bad keys or values in the defaults file', async () => {
    const problems = await problemsOf('video,run,direction,marker,model\nclips/a.mp4,fwd-1,forward,glowing,linear\n', JSON.stringify({ roi: 'everything', colour: 'red' }));
    expect(problems).toEqual([
      expect.stringMatching(/^day\.defaults\.json, "roi": roi "everything" is not a region/),
      expect.stringMatching(/^day\.defaults\.json, "colour": is not a key a defaults file may set/),
      expect.stringMatching(/^day\.csv, line 2, column 4 "marker": marker "glowing" is unknown; write bright, dark, texture or color:#rrggbb$/),
      expect.stringMatching(/^day\.csv, line 2, column 5 "model": model "linear" is unknown; write steady, spinup, spindown or auto$/),
    ]);
  });

  it('reads a markers column into the track settings and the tracker options, and refuses a count that is not 1–8', async () => {
    const dir = await folder();
    await writeFile(join(dir, 'day.csv'), 'video,run,direction,markers\nclips/a.mp4,two-arms,forward,2\nclips/b.mp4,one,reverse,\n');
    const m = await parseManifest(join(dir, 'day.csv'));
    expect(m.runs.map((r) => r.settings.track.markers)).toEqual([2, null]);
    const job = (i: number) => ({ settings: m.runs[i]!.settings, tools: {} }) as unknown as RunJob;
    expect(trackOptionsFor(job(0)).markers).toBe(2);
    expect(trackOptionsFor(job(1)).markers).toBeUndefined();
    const problems = await problemsOf('video,run,direction,markers\nclips/a.mp4,a,forward,0\nclips/b.mp4,b,forward,2.5\n');
    expect(problems).toEqual([
      expect.stringMatching(/^day\.csv, line 2, column 4 "markers": markers "0" is not a number of marker spots; write a whole number from 1 to 8$/),
      expect.stringMatching(/^day\.csv, line 3, column 4 "markers": markers "2\.5" is not a number of marker spots; write a whole number from 1 to 8$/),
    ]);
  });

  it('rejects an empty manifest and one with a header only', async () => {
    expect(await problemsOf('')).toEqual([expect.stringMatching(/^day\.csv: is empty/)]);
    expect(await problemsOf('video,run,direction\n')).toEqual([expect.stringMatching(/^day\.csv: has a header but no runs/)]);
  });
});
