// `npm run bench -- <name> [args…]` runs bench/<name>.mjs (after the build npm run bench does first);
// without a name it lists the benchmarks with the first line of each one's header comment.
import { spawnSync } from 'node:child_process';
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

const here = fileURLToPath(new URL('.', import.meta.url));
const names = readdirSync(here).filter((f) => f.endsWith('.mjs') && f !== 'run.mjs' && f !== 'fitScenarios.mjs').map((f) => f.slice(0, -4)).sort();
const [name, ...args] = process.argv.slice(2);
if (!name) {
  for (const n of names) {
    const first = readFileSync(join(here, `${n}.mjs`), 'utf8').split('\n').find((l) => l.startsWith('//')) ?? '';
    console.log(`${n.padEnd(18)} ${first.replace(/^\/\/\s*/, '')}`);
  }
  console.log('\nrun one: npm run bench -- <name> [arguments]; figures go to bench/RESULTS.md');
} else if (!names.includes(name)) {
  console.error(`bench: no benchmark named ${name}; choose one of ${names.join(', ')}`);
  process.exitCode = 2;
} else {
  process.exitCode = spawnSync(process.execPath, [join(here, `${name}.mjs`), ...args], { stdio: 'inherit' }).status ?? 1;
}
