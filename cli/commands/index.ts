/** Every command of the command line; a new command is one module added here. */
import type { Command } from '../io.js';
import { forcesCommand } from './forces.js';
import { sensingCommand } from './sensing.js';
import { sweepCommand } from './sweep.js';
import { turnCommand } from './turn.js';

export const COMMANDS: readonly Command[] = [forcesCommand, sensingCommand, turnCommand, sweepCommand];
