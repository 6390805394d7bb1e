import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

const root = fileURLToPath(new URL('../..', import.meta.url));

/** The installed executable (bin/plumb.js over dist/, which `npm ci` builds through `prepare`). */
describe('bin/plumb.js', () => {
  it('stops quietly when the reader closes the pipe early', () => {
    const run = spawnSync('bash', ['-c', 'node bin/plumb.js evaluate --help | head -c 20; exit ${PIPESTATUS[0]}'], { cwd: root, encoding: 'utf8' });
    expect(run.stdout).toBe('Usage: plumb evaluat');
    expect(run.stderr).not.toMatch(/EPIPE|Error|at /);
    expect(run.status).toBe(0);
  });
});
