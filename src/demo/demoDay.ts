import { resolveSynthSpec, type SynthSpecInput } from '../synth/SynthSpec.js';
import { anchorRegion } from '../synth/anchorRegion.js';
import type { Direction } from '../batch/RunRecord.js';

/**
 * The demo's invented scenario: a day on "Kestrel", the free-spinning three-vane rotor of the
 * (fictional) Hollin Bank hydraulics teaching lab, run in its acrylic flume in both flow directions
 * at three pump heads (12, 20 and 28 cm) with two replicates each. Forward turns counterclockwise
 * at tens to hundreds of deg/s; reverse flow turns it clockwise, tens of times slower. All numbers
 * are made up for the demo.
 */
export interface DemoRun {
  run: string;
  direction: Direction;
  /** Pump head, cm. */
  setting: number;
  notes: string;
  /** Clip file name inside the demo's clips/ folder. */
  clip: string;
  spec: SynthSpecInput;
  /** Manifest cells for this row beyond the common ones (roi, center, anchor, model…). */
  cells: Record<string, string>;
  /** The renderer's true rate (steady rate, or terminal rate for a spin-up), deg/s; null for the spoiled clip. */
  truth_rate_deg_s: number | null;
  /** The clip is cut short after rendering, as when a camera's card fills up: it must fail with a reason. */
  spoiled: boolean;
}

export interface DemoDayOptions {
  /** A reduced day for tests: fewer, shorter, smaller clips. */
  quick?: boolean;
}

/** Forward rate at pump head h (cm), deg/s: the invented rig's law 2.1·h^1.4. */
export function demoForwardRate(head_cm: number): number {
  return 2.1 * head_cm ** 1.4;
}

/** Reverse rate at pump head h (cm), deg/s: clockwise, −0.012·h^1.8 (about 40–65 times slower). */
export function demoReverseRate(head_cm: number): number {
  return -0.012 * head_cm ** 1.8;
}

/** The runs of the demo day, in manifest order. */
export function demoDay(options: DemoDayOptions = {}): DemoRun[] {
  const quick = options.quick ?? false;
  const width_px = quick ? 320 : 640;
  const height_px = quick ? 240 : 360;
  const duration_s = quick ? 3 : 8;
  const hubRadius_px = Math.round(height_px * 0.4);
  const cx_px = width_px / 2;
  const cy_px = height_px / 2;
  const markerRadius_px = Math.round(hubRadius_px * 0.75);
  const roi = `${cx_px - hubRadius_px - 6},${cy_px - hubRadius_px - 6},${2 * hubRadius_px + 12},${2 * hubRadius_px + 12}`;
  const center = `${cx_px},${cy_px}`;
  const base = (seed: number, profile: SynthSpecInput['profile'], realism: SynthSpecInput['realism'] = {}): SynthSpecInput => ({
    seed,
    width_px,
    height_px,
    fps: 30,
    duration_s,
    hub: { cx_px, cy_px, radius_px: hubRadius_px },
    markers: [{ radius_px: markerRadius_px, phase_deg: 20, size_px: quick ? 4 : 6, kind: 'bright' }],
    profile,
    realism: { noise_sigma: 2, crf: 23, flicker: { amplitude: 0.04, frequency_hz: 2.5 }, ...realism },
  });
  const heads = quick ? [20] : [12, 20, 28];
  const replicates = quick ? ['a'] : ['a', 'b'];
  const runs: DemoRun[] = [];
  let seed = 101;
  for (const head of heads) {
    for (const direction of ['forward', 'reverse'] as const) {
      for (const [i, rep] of replicates.entries()) {
        // replicate runs differ by a little between-run spread (±1.5 %), as real replicates do
        const spread = 1 + (i === 0 ? 0.015 : -0.015) * (direction === 'forward' ? 1 : -1);
        const rate = (direction === 'forward' ? demoForwardRate(head) : demoReverseRate(head)) * spread;
        const run = `${direction === 'forward' ? 'F' : 'R'}${head}-${rep}`;
        runs.push({
          run,
          direction,
          setting: head,
          notes: '',
          clip: `${run}.mp4`,
          spec: base(seed++, { kind: 'steady', angle0_deg: 0, rate_deg_s: rate }),
          // slow reverse runs sweep too short an arc for the centre to be found: give it, as one would
          // the camera was set square to the axis, so the tilt is known to be 0
          cells: { roi, center: direction === 'reverse' ? center : '', tilt: direction === 'reverse' ? '0' : '', model: 'steady' },
          truth_rate_deg_s: rate,
          spoiled: false,
        });
      }
    }
  }
  const midHead = 20;
  const fwd = demoForwardRate(midHead);
  const specials: DemoRun[] = [
    {
      run: 'F20-spinup',
      direction: 'forward',
      setting: midHead,
      notes: 'pump started 1 s into the clip',
      clip: 'F20-spinup.mp4',
      spec: base(seed++, { kind: 'spinup', angle0_deg: 0, t0_s: quick ? 0.5 : 1, terminal_rate_deg_s: fwd, tau_s: quick ? 0.6 : 1.5 }),
      cells: { roi, center, model: 'spinup' },
      truth_rate_deg_s: fwd,
      spoiled: false,
    },
    {
      run: 'F20-shaky',
      direction: 'forward',
      setting: midHead,
      notes: 'tripod knocked; camera shake removed with the fiducial as anchor',
      clip: 'F20-shaky.mp4',
      spec: base(seed++, { kind: 'steady', angle0_deg: 0, rate_deg_s: fwd * 1.01 }, { shake: { translation_px: 2, rotation_deg: 0.2, bandwidth_hz: 3 } }),
      cells: { roi, center, model: 'steady', anchor: '' },
      truth_rate_deg_s: fwd * 1.01,
      spoiled: false,
    },
    {
      run: 'F28-oblique',
      direction: 'forward',
      setting: quick ? midHead : 28,
      notes: 'filmed from the side of the flume, about 35° off the axis',
      clip: 'F28-oblique.mp4',
      spec: base(seed++, { kind: 'steady', angle0_deg: 0, rate_deg_s: demoForwardRate(quick ? midHead : 28) * 0.99 }, { oblique: { tilt_deg: 35, axis_deg: 0 } }),
      cells: { roi, model: 'steady' },
      truth_rate_deg_s: demoForwardRate(quick ? midHead : 28) * 0.99,
      spoiled: false,
    },
    {
      run: `R${quick ? midHead : 12}-phone`,
      direction: 'reverse',
      setting: quick ? midHead : 12,
      notes: 'filmed on a phone: variable frame timing, two dropped frames',
      clip: `R${quick ? midHead : 12}-phone.mp4`,
      spec: base(seed++, { kind: 'steady', angle0_deg: 0, rate_deg_s: demoReverseRate(quick ? midHead : 12) }, { timing: { jitter_s: 0.006, dropped_frames: [17, 41] } }),
      cells: { roi, center, tilt: '0', model: 'steady' },
      truth_rate_deg_s: demoReverseRate(quick ? midHead : 12),
      spoiled: false,
    },
    {
      run: `R${quick ? midHead : 28}-cut`,
      direction: 'reverse',
      setting: quick ? midHead : 28,
      notes: 'memory card filled during recording',
      clip: `R${quick ? midHead : 28}-cut.mp4`,
      spec: base(seed++, { kind: 'steady', angle0_deg: 0, rate_deg_s: demoReverseRate(28) }),
      cells: { roi, center, model: 'steady' },
      truth_rate_deg_s: null,
      spoiled: true,
    },
  ];
  // the shaken run locks onto the scene's fixed checkerboard fiducial
  const shaky = specials.find((r) => r.run === 'F20-shaky')!;
  const a = anchorRegion(resolveSynthSpec(shaky.spec));
  if (a) shaky.cells.anchor = `${a.x},${a.y},${a.w},${a.h}`;
  return quick ? [...runs, ...specials.filter((r) => r.run !== 'F28-oblique')] : [...runs, ...specials];
}
