import { access, stat } from 'node:fs/promises';
import { constants } from 'node:fs';
import { createRequire } from 'node:module';
import { delimiter, join } from 'node:path';
import { InputError } from '../errors.js';
import { runToolToEnd } from './runTool.js';

/** Where a tool was found. */
export type ToolSource = 'option' | 'env' | 'ffmpeg-static' | '@ffmpeg-installer/ffmpeg' | '@ffprobe-installer/ffprobe' | 'PATH';

/** A candidate that was looked at and passed over, with the reason (shown by `revtrace doctor`). */
export interface SkippedTool {
  path: string;
  source: ToolSource;
  reason: string;
}

/** One located executable. */
export interface ToolInfo {
  path: string;
  source: ToolSource;
  /** The version word from `<tool> -version` (e.g. "4.4.2" or a git build "N-47683-g0e8eb07980"). */
  version: string;
  /** Candidates tried before this one and why they were not used. */
  skipped: SkippedTool[];
}

/** The located ffmpeg, with what its options support. */
export interface FfmpegInfo extends ToolInfo {
  /** Output options that pass every decoded frame through once with its own timestamp. */
  passthroughArgs: string[];
}

/** ffmpeg and ffprobe as found by locateTools. */
export interface ToolPaths {
  ffmpeg: FfmpegInfo;
  ffprobe: ToolInfo;
}

/** Where to look first; each field overrides the search for that tool. */
export interface LocateToolsOptions {
  /** Explicit ffmpeg path (the `--ffmpeg` option); default: search. */
  ffmpeg?: string;
  /** Explicit ffprobe path (the `--ffprobe` option); default: search. */
  ffprobe?: string;
  /** Environment to read REVTRACE_FFMPEG / REVTRACE_FFPROBE / PATH from (default process.env). */
  env?: NodeJS.ProcessEnv;
  /** Look in ffmpeg-static and the @ffmpeg-installer / @ffprobe-installer packages (default true). */
  packages?: boolean;
}

type ToolName = 'ffmpeg' | 'ffprobe';

/** Milliseconds a tool may take to answer `-version` before it is passed over. */
const VERSION_TIMEOUT_MS = 15_000;

const cache = new Map<string, Promise<ToolInfo>>();
const fpsModeCache = new Map<string, Promise<string[]>>();

/**
 * Finds ffmpeg and ffprobe, in this order: explicit option, REVTRACE_FFMPEG / REVTRACE_FFPROBE,
 * `ffmpeg-static` (ffmpeg only, if installed), the `@ffmpeg-installer/ffmpeg` and
 * `@ffprobe-installer/ffprobe` binaries, then PATH. A candidate that is missing, not executable or
 * does not answer `-version` is skipped with a reason; an explicit option or environment variable
 * that does not work is an InputError (it is never silently replaced). Results are cached per process.
 */
export async function locateTools(options: LocateToolsOptions = {}): Promise<ToolPaths> {
  const [ffmpeg, ffprobe] = await Promise.all([locateFfmpeg(options), locateTool('ffprobe', options)]);
  return { ffmpeg, ffprobe };
}

/** Finds ffmpeg alone (see locateTools) and which passthrough option it understands. */
export async function locateFfmpeg(options: LocateToolsOptions = {}): Promise<FfmpegInfo> {
  const info = await locateTool('ffmpeg', options);
  let flags = fpsModeCache.get(info.path);
  if (!flags) {
    flags = detectPassthroughArgs(info.path);
    fpsModeCache.set(info.path, flags);
  }
  return { ...info, passthroughArgs: await flags };
}

/** Finds one tool (see locateTools). */
export function locateTool(name: ToolName, options: LocateToolsOptions = {}): Promise<ToolInfo> {
  const env = options.env ?? process.env;
  const packages = options.packages ?? true;
  const key = JSON.stringify([name, options[name], env[envName(name)], env.PATH, packages]);
  let found = cache.get(key);
  if (!found) {
    found = search(name, options[name], env, packages);
    cache.set(key, found);
    found.catch(() => cache.delete(key));
  }
  return found;
}

function envName(name: ToolName): string {
  return name === 'ffmpeg' ? 'REVTRACE_FFMPEG' : 'REVTRACE_FFPROBE';
}

async function search(name: ToolName, explicit: string | undefined, env: NodeJS.ProcessEnv, packages: boolean): Promise<ToolInfo> {
  if (explicit !== undefined && explicit !== '') return mustWork(name, explicit, 'option', `--${name} ${explicit}`);
  const fromEnv = env[envName(name)];
  if (fromEnv !== undefined && fromEnv !== '') return mustWork(name, fromEnv, 'env', `${envName(name)}=${fromEnv}`);

  const skipped: SkippedTool[] = [];
  for await (const candidate of packages ? packagedCandidates(name) : noCandidates()) {
    const verdict = await tryCandidate(name, candidate.path);
    if (typeof verdict === 'string') { skipped.push({ ...candidate, reason: verdict }); continue; }
    return { ...candidate, version: verdict.version, skipped };
  }
  for (const dir of (env.PATH ?? '').split(delimiter)) {
    if (dir === '') continue;
    const path = join(dir, process.platform === 'win32' ? `${name}.exe` : name);
    if (!(await isFile(path))) continue;
    const verdict = await tryCandidate(name, path);
    if (typeof verdict === 'string') { skipped.push({ path, source: 'PATH', reason: verdict }); continue; }
    return { path, source: 'PATH', version: verdict.version, skipped };
  }
  const tried = skipped.length > 0 ? ` (passed over: ${skipped.map((s) => `${s.path}: ${s.reason}`).join('; ')})` : '';
  throw new InputError(`No working ${name} was found${tried}; install ffmpeg, or pass --${name} <path>, or set ${envName(name)}.`);
}

/** An explicitly named tool must work; otherwise the person is told exactly what is wrong with it. */
async function mustWork(name: ToolName, path: string, source: ToolSource, given: string): Promise<ToolInfo> {
  const verdict = await tryCandidate(name, path);
  if (typeof verdict === 'string') throw new InputError(`${given} cannot be used: ${verdict}; give the path of a working ${name} executable.`);
  return { path, source, version: verdict.version, skipped: [] };
}

async function* noCandidates(): AsyncGenerator<{ path: string; source: ToolSource }> {
  return;
}

/** Package-provided binaries, in order of preference. */
async function* packagedCandidates(name: ToolName): AsyncGenerator<{ path: string; source: ToolSource }> {
  const require = createRequire(import.meta.url);
  if (name === 'ffmpeg') {
    try {
      const moduleName = 'ffmpeg-static'; // optional dependency: loaded only if present
      const mod = (await import(moduleName)) as { default?: unknown };
      if (typeof mod.default === 'string') yield { path: mod.default, source: 'ffmpeg-static' };
    } catch {
      // not installed
    }
    const path = packagePath(require, '@ffmpeg-installer/ffmpeg', `@ffmpeg-installer/${process.platform}-${process.arch}/ffmpeg${process.platform === 'win32' ? '.exe' : ''}`);
    if (path) yield { path, source: '@ffmpeg-installer/ffmpeg' };
  } else {
    const path = packagePath(require, '@ffprobe-installer/ffprobe', `@ffprobe-installer/${process.platform}-${process.arch}/ffprobe${process.platform === 'win32' ? '.exe' : ''}`);
    if (path) yield { path, source: '@ffprobe-installer/ffprobe' };
  }
}

/** The binary path an installer package reports, else the platform package's file, else undefined. */
function packagePath(require: NodeJS.Require, pkg: string, platformFile: string): string | undefined {
  try {
    const mod = require(pkg) as { path?: unknown };
    if (typeof mod.path === 'string') return mod.path;
  } catch {
    // the package throws when its binary is missing
  }
  try {
    return require.resolve(platformFile);
  } catch {
    return undefined;
  }
}

async function isFile(path: string): Promise<boolean> {
  try {
    return (await stat(path)).isFile();
  } catch {
    return false;
  }
}

/** Checks one candidate: a file, executable by us, that answers `-version` like the named tool. Returns the reason when not. */
async function tryCandidate(name: ToolName, path: string): Promise<{ version: string } | string> {
  let mode: number;
  try {
    const s = await stat(path);
    if (!s.isFile()) return 'it is not a file';
    mode = s.mode;
  } catch {
    return 'no such file';
  }
  try {
    await access(path, constants.X_OK);
  } catch {
    return `it is not executable for this user (mode ${(mode & 0o777).toString(8)}; run chmod +x ${path})`;
  }
  let out: string;
  try {
    out = (await runToolToEnd(path, ['-version'], { tool: name, timeout_ms: VERSION_TIMEOUT_MS })).toString('utf8');
  } catch (err) {
    return `running it with -version failed (${err instanceof Error ? err.message.replace(/\.$/, '') : String(err)})`;
  }
  const match = new RegExp(`^${name} version (\\S+)`, 'm').exec(out);
  if (!match) return `its -version output does not name ${name}`;
  return { version: match[1]! };
}

/** `-fps_mode passthrough` on ffmpeg 5.1 and later, `-vsync passthrough` on older builds (detected from `-h long`). */
async function detectPassthroughArgs(path: string): Promise<string[]> {
  let help = '';
  try {
    help = (await runToolToEnd(path, ['-hide_banner', '-h', 'long'], { tool: 'ffmpeg', timeout_ms: VERSION_TIMEOUT_MS })).toString('utf8');
  } catch {
    // fall back to the older spelling
  }
  return /^-fps_mode\b/m.test(help) ? ['-fps_mode', 'passthrough'] : ['-vsync', 'passthrough'];
}
