import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

const bin = fileURLToPath(new URL('../../bin/revtrace', import.meta.url));

describe('revtrace command line', () => {
  it('prints its version from package.json', () => {
    const r = spawnSync(process.execPath, [bin, '--version'], { encoding: 'utf8' });
    expect(r.status).toBe(0);
    const pkg = JSON.parse(readFileSync(new URL('../../package.json', import.meta.url), 'utf8')) as { version: string };
    expect(r.stdout.trim()).toBe(pkg.version);
  });

  it('rejects an unknown command with one line, exit code 2 and no stack trace', () => {
    const r = spawnSync(process.execPath, [bin, 'no-such-command'], { encoding: 'utf8' });
    expect(r.status).toBe(2);
    expect(r.stderr).toBe("revtrace: unknown command 'no-such-command' (run revtrace --help for usage)\n");
  });

  it('names a missing required option in one line', () => {
    const r = spawnSync(process.execPath, [bin, 'fit', 'angle.csv'], { encoding: 'utf8' });
    expect(r.status).toBe(2);
    expect(r.stderr).toBe("revtrace: required option '--out <fit.json>' not specified (run revtrace --help for usage)\n");
  });
});
