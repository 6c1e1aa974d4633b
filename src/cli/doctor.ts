import type { Command } from 'commander';
import { locateTool, locateFfmpeg } from '../video/locateTools.js';
import type { ToolInfo } from '../video/locateTools.js';
import { loadOpenCv } from '../track/loadOpenCv.js';
import { VERSION } from '../version.js';
import { globalOptions } from './globalOptions.js';

/** One line of the doctor's findings. */
interface Finding {
  name: string;
  ok: boolean;
  detail: Record<string, unknown>;
  text: string;
}

async function checkTool(name: 'ffmpeg' | 'ffprobe', explicit: string | undefined): Promise<Finding> {
  try {
    const info: ToolInfo = name === 'ffmpeg' ? await locateFfmpeg({ ffmpeg: explicit }) : await locateTool('ffprobe', { ffprobe: explicit });
    const skipped = info.skipped.map((s) => `\n    passed over ${s.path} (${s.source}): ${s.reason}`).join('');
    return {
      name,
      ok: true,
      detail: { path: info.path, source: info.source, version: info.version, skipped: info.skipped },
      text: `${name.padEnd(8)} ok   ${info.version} from ${info.source}: ${info.path}${skipped}`,
    };
  } catch (err) {
    const message = err instanceof Error ? err.message : String(err);
    return { name, ok: false, detail: { error: message }, text: `${name.padEnd(8)} FAIL ${message}` };
  }
}

async function checkOpenCv(): Promise<Finding> {
  const start = performance.now();
  try {
    const cv = await loadOpenCv();
    const load_s = (performance.now() - start) / 1000;
    const build = typeof (cv as unknown as { getBuildInformation?: () => string }).getBuildInformation === 'function'
      ? /General configuration for OpenCV ([\w.\-]+)/.exec((cv as unknown as { getBuildInformation: () => string }).getBuildInformation())?.[1] ?? 'unknown' : 'unknown';
    return { name: 'opencv', ok: true, detail: { version: build, load_s }, text: `opencv   ok   ${build}, loaded and initialised in ${load_s.toFixed(2)} s` };
  } catch (err) {
    const message = err instanceof Error ? err.message : String(err);
    return { name: 'opencv', ok: false, detail: { error: message }, text: `opencv   FAIL could not load @techstark/opencv-js: ${message}` };
  }
}

/** `revtrace doctor`: which ffmpeg and ffprobe are used (path, origin, version) and how long OpenCV takes to load. */
export function registerDoctor(program: Command): void {
  program
    .command('doctor')
    .description('check the tools revtrace needs: where ffmpeg and ffprobe were found and their versions, and how long OpenCV takes to load')
    .option('--json', 'print one JSON object instead of text')
    .action(async (o: { json?: boolean }, command: Command) => {
      const g = globalOptions(command);
      const findings = [await checkTool('ffmpeg', g.ffmpeg), await checkTool('ffprobe', g.ffprobe), await checkOpenCv()];
      const ok = findings.every((f) => f.ok);
      if (o.json) {
        process.stdout.write(`${JSON.stringify({ revtrace: VERSION, node: process.version, ok, ...Object.fromEntries(findings.map((f) => [f.name, { ok: f.ok, ...f.detail }])) })}\n`);
      } else {
        process.stdout.write(`revtrace ${VERSION} on Node ${process.version}\n${findings.map((f) => f.text).join('\n')}\n${ok ? 'all good' : 'some checks failed: see FAIL lines above'}\n`);
      }
      // A missing tool is a setup problem the person fixes (exit 2), like any bad input.
      if (!ok) process.exitCode = 2;
    });
}
