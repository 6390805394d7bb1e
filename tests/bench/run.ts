/**
 * `npm run bench`: runs every benchmark in turn and prints its figures. Benchmarks are never part of
 * `npm test`; the machines are shared and noisy, so each reports medians and ratios.
 * `npm run bench -- ingest model` runs only the named ones.
 */
import { readdirSync } from 'node:fs';
import { dirname, join, basename } from 'node:path';
import { fileURLToPath } from 'node:url';
import os from 'node:os';

const here = dirname(fileURLToPath(import.meta.url));
const wanted = process.argv.slice(2);
const names = readdirSync(here)
  .filter((f) => f.endsWith('.ts') && f !== 'run.ts' && !f.startsWith('_'))
  .map((f) => basename(f, '.ts'))
  .filter((n) => wanted.length === 0 || wanted.includes(n))
  .sort();

console.log(`plumb benchmarks on ${os.cpus().length} × ${os.cpus()[0]?.model ?? 'cpu'}, ${(os.totalmem() / 2 ** 30).toFixed(0)} GiB, Node ${process.version}`);
for (const name of names) {
  console.log(`\n## ${name}`);
  const mod = (await import(join(here, `${name}.ts`))) as { run?: () => Promise<void> };
  if (typeof mod.run !== 'function') {
    console.log(`(tests/bench/${name}.ts exports no run())`);
    continue;
  }
  const started = performance.now();
  await mod.run();
  console.log(`(${name}: ${((performance.now() - started) / 1000).toFixed(1)} s)`);
}
