import type { Command } from 'commander';
import type { CliIO, ExitCode } from './io.js';

/**
 * A command registers itself on the program; its action returns the exit code instead of exiting.
 * One file per command under `src/cli/`, listed in `src/cli/main.ts`.
 */
export interface CommandContext {
  io: CliIO;
  setExitCode(code: ExitCode): void;
}

export type RegisterCommand = (program: Command, context: CommandContext) => void;
