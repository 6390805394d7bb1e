import { Readable } from 'node:stream';
import { execute } from '../../src/cli/main.js';
import type { CliIO, ExitCode } from '../../src/cli/io.js';

export interface CliRun {
  stdout: string;
  stderr: string;
  exitCode: ExitCode;
}

/** Runs the CLI in-process with captured streams, as a user would from a non-TTY shell. */
export async function runCli(argv: string[], options: { stdin?: string | Buffer; env?: Record<string, string>; cwd?: string } = {}): Promise<CliRun> {
  let stdout = '';
  let stderr = '';
  const io: CliIO = {
    stdout: { write: (s: string) => (stdout += s) },
    stderr: { write: (s: string) => (stderr += s), isTTY: false },
    stdin: Readable.from(options.stdin === undefined ? [] : [options.stdin]),
    env: { ...options.env },
    cwd: options.cwd ?? process.cwd(),
  };
  const exitCode = await execute(argv, io);
  return { stdout, stderr, exitCode };
}
