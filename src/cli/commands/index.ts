/** Every CLI command registers itself here; one import line per command file. */
import type { Command } from 'commander';

export type RegisterCommand = (program: Command) => void;

export const commands: RegisterCommand[] = [];
