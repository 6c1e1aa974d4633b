import type { Command } from 'commander';
import { registerBatch } from './batch.js';
import { registerDemo } from './demo.js';
import { registerDoctor } from './doctor.js';
import { registerFit } from './fit.js';
import { registerProbe } from './probe.js';
import { registerReport } from './report.js';
import { registerSynth } from './synth.js';
import { registerTrack } from './track.js';

/** Every sub-command registers itself from its own file in cli/; add yours here. */
export const commands: Array<(program: Command) => void> = [registerBatch, registerProbe, registerDoctor, registerSynth, registerReport, registerFit, registerDemo, registerTrack];
