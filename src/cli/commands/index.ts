/** Every CLI command registers itself here; one import line per command file. */
import type { Command } from 'commander';
import { register as criticalDistance } from './criticalDistance.js';
import { register as fitNotches } from './fitNotches.js';
import { register as fitRate } from './fitRate.js';
import { register as batch } from './batch.js';
import { register as merge } from './merge.js';
import { register as report } from './report.js';
import { register as info } from './info.js';
import { register as render } from './render.js';
import { register as measure } from './measure.js';
import { register as teach } from './teach.js';

export type RegisterCommand = (program: Command) => void;

export const commands: RegisterCommand[] = [measure, teach, batch, merge, report, criticalDistance, fitNotches, fitRate, info, render];
