/**
 * What a command may touch of the outside world. Tests pass buffers; `bin/plumb.js` passes the
 * process's streams. Output for machines goes to `stdout`; progress, colour and messages to `stderr`.
 */
export interface CliIO {
  stdout: { write(chunk: string): unknown };
  stderr: { write(chunk: string): unknown; isTTY?: boolean };
  stdin: NodeJS.ReadableStream;
  env: Record<string, string | undefined>;
  cwd: string;
}

export function processIO(): CliIO {
  return { stdout: process.stdout, stderr: process.stderr, stdin: process.stdin, env: process.env, cwd: process.cwd() };
}

/** Colour and progress bars only on a TTY, and never when NO_COLOR or CI is set. */
export function isInteractive(io: CliIO): boolean {
  return Boolean(io.stderr.isTTY) && io.env.NO_COLOR === undefined && io.env.CI === undefined;
}

export type ExitCode = 0 | 1 | 2 | 3;
