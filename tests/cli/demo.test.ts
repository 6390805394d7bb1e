import { describe, expect, it } from 'vitest';
import { runCli } from '../helpers/cli.js';

/** `plumb demo`'s flags; a whole run is in tests/e2e/demo-cli.test.ts. */
describe('plumb demo: flags', () => {
  it('refuses a --scale outside (0, 10] and a --seed that is not a whole number (2), before any work', async () => {
    for (const value of ['0', '-1', '11', 'big', '']) {
      const run = await runCli(['demo', '--scale', value, '--out', '/nonexistent/never-written']);
      expect(run.exitCode, value).toBe(2);
      expect(run.stderr).toContain('--scale must be above 0 and at most 10');
      expect(run.stderr).toContain('hint:');
    }
    for (const value of ['seven', '1.5', '-3']) {
      const run = await runCli(['demo', '--seed', value, '--out', '/nonexistent/never-written']);
      expect(run.exitCode, value).toBe(2);
      expect(run.stderr).toContain('--seed must be a whole number');
    }
  });

  it('is listed in the help, and its own help names every option and where the reports go', async () => {
    const top = await runCli(['--help']);
    expect(top.exitCode).toBe(0);
    expect(top.stdout).toMatch(/\bdemo\b/);
    const help = await runCli(['demo', '--help']);
    expect(help.exitCode).toBe(0);
    for (const flag of ['--out', '--scale', '--seed', '--fast']) expect(help.stdout).toContain(flag);
    expect(help.stdout).toContain('<out>/audit/');
    expect(help.stdout).toContain('reports/demo');
  });

  it('refuses an unknown option (2)', async () => {
    const run = await runCli(['demo', '--sclae', '1']);
    expect(run.exitCode).toBe(2);
    expect(run.stderr).toContain('--sclae');
  });
});
