import { Command, CommanderError } from 'commander';
import { PlumbError, formatPosition } from '../errors.js';
import type { RegisterCommand } from './commands.js';
import { processIO, type CliIO, type ExitCode } from './io.js';
import { VERSION } from '../version.js';
import { registerStats } from './stats.js';
import { registerCheck } from './check.js';
import { registerAudit } from './audit.js';
import { registerGate } from './gate.js';
import { registerCorrupt } from './corrupt.js';
import { registerFit } from './fit.js';
import { registerEvaluate } from './evaluate.js';
import { registerDemo } from './demo.js';

/** Every command, in the order `--help` lists them. Add a command by adding its file here. */
const COMMANDS: RegisterCommand[] = [registerAudit, registerCheck, registerFit, registerGate, registerStats, registerCorrupt, registerEvaluate, registerDemo];

export function buildProgram(io: CliIO, setExitCode: (code: ExitCode) => void): Command {
  const program = new Command('plumb')
    .description(
      'Audit an RDF knowledge graph: check it against its declared and mined constraints, rank its ' +
        'triples by how plausible a relational graph model finds them, and report the findings for review.',
    )
    .version(VERSION, '-V, --version')
    .showHelpAfterError('(run `plumb <command> --help` for the options)')
    .configureOutput({ writeOut: (s) => io.stdout.write(s), writeErr: (s) => io.stderr.write(s) })
    .exitOverride();
  program.addHelpText(
    'after',
    '\nExit codes: 0 passed, 1 a gate or --fail-on threshold was crossed, 2 bad usage or unreadable input,\n' +
      '3 an internal fault. Findings are candidates for a human reviewer, not verdicts.',
  );
  for (const register of COMMANDS) register(program, { io, setExitCode });
  for (const sub of program.commands) {
    sub.exitOverride().configureOutput({ writeOut: (s) => io.stdout.write(s), writeErr: (s) => io.stderr.write(s) });
  }
  return program;
}

/**
 * Runs the CLI in-process and returns its exit code; never calls `process.exit`. A 2 (bad input)
 * or 3 (internal fault) is never downgraded by a later step.
 */
export async function execute(argv: readonly string[], io: CliIO = processIO()): Promise<ExitCode> {
  let exitCode: ExitCode = 0;
  const setExitCode = (code: ExitCode): void => {
    if (exitCode < 2 || code >= 2) exitCode = Math.max(exitCode, code) as ExitCode;
  };
  const program = buildProgram(io, setExitCode);
  try {
    if (argv.length === 0) {
      program.outputHelp();
      return 2;
    }
    await program.parseAsync([...argv], { from: 'user' });
    return exitCode;
  } catch (error) {
    return reportError(error, io);
  }
}

function reportError(error: unknown, io: CliIO): ExitCode {
  if (error instanceof CommanderError) {
    // Help and version are successful exits; commander has already printed its message otherwise.
    if (error.code === 'commander.helpDisplayed' || error.code === 'commander.version' || error.code === 'commander.help') return 0;
    return 2;
  }
  if (error instanceof PlumbError) {
    const where = error.position ? `${formatPosition(error.position)}: ` : '';
    io.stderr.write(`plumb: ${where}${error.message}\n`);
    if (error.hint) io.stderr.write(`  hint: ${error.hint}\n`);
    return error.exitCode;
  }
  const message = error instanceof Error ? error.message : String(error);
  if (/memory access out of bounds|Aborted\(\)|Out of memory/i.test(message)) {
    io.stderr.write(
      'plumb: the model ran out of WebAssembly memory (4 GB at most)\n' +
        '  hint: use a smaller --dim, fewer --layers, or --edge-sample; or install @tensorflow/tfjs-node\n',
    );
    return 3;
  }
  io.stderr.write(`plumb: internal error: ${message}\n`);
  io.stderr.write('  hint: this is a bug in plumb; set PLUMB_DEBUG=1 to see the stack and report it\n');
  if (io.env.PLUMB_DEBUG && error instanceof Error && error.stack) io.stderr.write(`${error.stack}\n`);
  return 3;
}
