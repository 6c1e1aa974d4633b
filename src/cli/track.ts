import type { Command } from 'commander';
import { ensureWritableFolder } from '../ensureWritableFolder.js';
import { InputError, InterruptedError } from '../errors.js';
import { toRegion } from '../track/TrackOptions.js';
import { probeVideoHeader } from '../video/probeVideo.js';
import { globalOptions } from './globalOptions.js';

interface TrackCliOptions {
  out: string;
  roi?: string;
  center?: string;
  marker?: string;
  markers?: string;
  anchor?: string;
  from?: string;
  to?: string;
  tilt?: string;
  tolerance?: string;
  quiet?: boolean;
}

function numberOption(name: string, value: string | undefined): number | undefined {
  if (value === undefined) return undefined;
  const v = Number(value.trim());
  if (value.trim() === '' || !Number.isFinite(v)) throw new InputError(`${name} "${value}" is not a number; give it in ${name === '--tilt' ? 'degrees' : 'seconds'}`);
  return v;
}

/** `--markers n`: a whole number of marker spots, 1 to 8. */
function markerCountOption(value: string | undefined): number | undefined {
  if (value === undefined) return undefined;
  const v = Number(value.trim());
  if (value.trim() === '' || !Number.isInteger(v) || v < 1 || v > 8) throw new InputError(`--markers "${value}" must be a whole number of marker spots from 1 to 8`);
  return v;
}

/** `revtrace track <video> --out <dir>`: the hub's unwrapped angle per frame → angle.csv, track.json, preview.png. */
export function registerTrack(program: Command): void {
  program
    .command('track')
    .description('follow the marker on a rotating hub and write its unwrapped angle per frame (angle.csv, track.json, preview.png)')
    .argument('<video>', 'video file')
    .requiredOption('--out <dir>', 'output folder')
    .option('--roi <x,y,w,h>', 'region the marker moves in, full-frame pixels (default: whole frame)')
    .option('--center <x,y>', 'rotation centre in pixels (default: fitted from the marker path)')
    .option('--marker <kind>', 'bright | dark | color:<hex> | texture', 'bright')
    .option('--markers <n>', 'number of marker spots on the hub, followed and combined (bright, dark, colour)', '1')
    .option('--tolerance <deltaE>', 'colour marker: largest CIELAB difference still counted as the marker', '40')
    .option('--anchor <x,y,w,h>', 'a still part of the scene, to take camera shake off the marker')
    .option('--from <s>', 'start time, seconds')
    .option('--to <s>', 'end time, seconds')
    .option('--tilt <deg>', 'camera tilt from square-on, degrees (for runs too short to fit the view)')
    .option('--quiet', 'print nothing but errors (progress is shown only on a terminal)')
    .action(async (video: string, o: TrackCliOptions, command: Command) => {
      const g = globalOptions(command);
      // the video's header is read while the stage loads (it is loaded only when the command runs, so other
      // commands and --help do not pay for its imports); a failure surfaces where trackVideo would report it
      const probing = probeVideoHeader(video, { ffprobe: g.ffprobe });
      probing.catch(() => undefined);
      const [{ trackVideo }, { writeTrackOutputs }] = await Promise.all([import('../track/trackVideo.js'), import('../track/writeTrackOutputs.js')]);
      let centre: { x_px: number; y_px: number } | undefined;
      if (o.center !== undefined) {
        const p = o.center.split(',').map((s) => Number(s.trim()));
        if (p.length !== 2 || !p.every(Number.isFinite)) throw new InputError(`--center "${o.center}" must be two numbers x,y in pixels`);
        centre = { x_px: p[0], y_px: p[1] };
      }
      await ensureWritableFolder(o.out, '--out');
      const controller = new AbortController();
      const onSignal = () => controller.abort(new InterruptedError(`interrupted; nothing was written to ${o.out}`));
      process.on('SIGINT', onSignal);
      process.on('SIGTERM', onSignal);
      let lastPrint = Date.now();
      try {
        const result = await trackVideo(video, {
          header: await probing,
          roi: o.roi !== undefined ? toRegion('--roi', o.roi) : undefined,
          centre,
          marker: o.marker,
          markers: markerCountOption(o.markers),
          colour_tolerance: numberOption('--tolerance', o.tolerance),
          anchor: o.anchor !== undefined ? toRegion('--anchor', o.anchor) : undefined,
          from_s: numberOption('--from', o.from),
          to_s: numberOption('--to', o.to),
          tilt_deg: numberOption('--tilt', o.tilt),
          ffmpeg: g.ffmpeg,
          ffprobe: g.ffprobe,
          signal: controller.signal,
          onProgress: o.quiet || !process.stderr.isTTY
            ? undefined
            : (p) => {
                const now = Date.now();
                if (now - lastPrint < 1000) return;
                lastPrint = now;
                process.stderr.write(`tracking: ${p.frames} frames, ${p.t_s.toFixed(1)} / ${p.duration_s.toFixed(1)} s\n`);
              },
        });
        await writeTrackOutputs(o.out, result);
        if (!o.quiet) {
          const s = result.summary;
          const n = result.series.angle_deg.length;
          let first = NaN;
          let last = NaN;
          for (let i = 0; i < n; i++) if (Number.isFinite(result.series.angle_deg[i])) { if (Number.isNaN(first)) first = result.series.angle_deg[i]; last = result.series.angle_deg[i]; }
          process.stdout.write(
            `${s.frames.decoded} frames, ${s.frames.lost} lost; centre ${s.centre.x_px.value.toFixed(2)},${s.centre.y_px.value.toFixed(2)} px (${s.centre.source})` +
              `${s.view ? `, tilt ${s.view.tilt_deg.value.toFixed(1)}°${s.view.corrected ? ' (corrected)' : ''}` : ''}; turned ${(last - first).toFixed(2)}°\n`,
          );
          for (const w of s.warnings) process.stdout.write(`warning: ${w}\n`);
          process.stdout.write(`wrote ${o.out}/angle.csv, track.json, preview.png\n`);
        }
      } finally {
        process.off('SIGINT', onSignal);
        process.off('SIGTERM', onSignal);
      }
    });
}
