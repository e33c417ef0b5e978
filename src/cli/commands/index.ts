/** Every CLI command registers itself here; one import line per command file. */
import type { Command } from 'commander';
import { register as criticalDistance } from './critical-distance.js';
import { register as fitNotches } from './fit-notches.js';
import { register as fitRate } from './fit-rate.js';

export type RegisterCommand = (program: Command) => void;

export const commands: RegisterCommand[] = [criticalDistance, fitNotches, fitRate];
