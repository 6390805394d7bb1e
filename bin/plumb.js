#!/usr/bin/env node
import { execute } from '../dist/src/cli/main.js';

// A reader that stops early (`plumb … | head`) closes the pipe: stop quietly, as Unix tools do,
// instead of dying on the write with a stack trace.
for (const stream of [process.stdout, process.stderr]) {
  stream.on('error', (error) => {
    if (error.code === 'EPIPE') process.exit(0);
    throw error;
  });
}
process.exitCode = await execute(process.argv.slice(2));
