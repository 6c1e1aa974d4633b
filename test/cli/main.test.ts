import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';

const bin = fileURLToPath(new URL('../../bin/revtrace', import.meta.url));

describe('revtrace command line', () => {
  it('prints its version from package.json', () => {
    const r = spawnSync(process.execPath, [bin, '--version'], { encoding: 'utf8' });
    expect(r.status).toBe(0);
    expect(r.stdout.trim()).toMatch(/^\d+\.\d+\.\d+$/);
  });

  it('rejects an unknown command with exit code 2 and no stack trace', () => {
    const r = spawnSync(process.execPath, [bin, 'no-such-command'], { encoding: 'utf8' });
    expect(r.status).toBe(2);
    expect(r.stderr).not.toMatch(/\n\s+at /);
  });
});
