import { existsSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { validateReport } from '../../src/report/index.js';
import { runCli } from '../helpers/cli.js';

/**
 * `plumb demo` through the CLI on a small, fast scenario: it writes the data, the model and every
 * report under --out, prints where they are and what the gate found, and exits 0 although the gate
 * failed (the incoming file holds planted errors). The figures themselves are asserted in
 * demo.test.ts beside this file; usage errors in tests/cli/demo.test.ts. A whole demo run takes
 * 20–70 s on two cores, so it lives with the end-to-end tests.
 */
describe('plumb demo', () => {
  it('builds, audits and gates a small scenario, writes the reports and says what was found (exit 0)', async () => {
    const root = mkdtempSync(join(tmpdir(), 'plumb-demo-cli-'));
    const run = await runCli(['demo', '--out', 'demo-out', '--scale', '0.1', '--seed', '11', '--fast'], { cwd: root });
    expect(run.stderr).not.toContain('plumb:');
    expect(run.exitCode).toBe(0);
    const out = join(root, 'demo-out');
    for (const f of ['data/base.nt', 'data/incoming.nt', 'data/ontology.ttl', 'data/shapes.ttl', 'data/truth.json', 'model/model.json']) {
      expect(existsSync(join(out, f)), f).toBe(true);
    }
    for (const dir of ['audit', 'gate']) {
      for (const f of ['report.html', 'report.json', 'report.sarif', 'junit.xml', 'summary.md']) expect(existsSync(join(out, dir, f)), `${dir}/${f}`).toBe(true);
      expect(validateReport(JSON.parse(readFileSync(join(out, dir, 'report.json'), 'utf8')))).toEqual([]);
    }
    // Paths are shown relative to the working folder, as the user typed them.
    expect(run.stdout).toContain('demo-out/audit/report.html');
    expect(run.stdout).toContain('demo-out/gate/report.html');
    expect(run.stdout).toContain('FAILED, as expected');
    const truth = JSON.parse(readFileSync(join(out, 'data', 'truth.json'), 'utf8')) as Array<{ kind: string }>;
    const schemaErrors = truth.filter((e) => e.kind !== 'plausible').length;
    expect(run.stdout).toContain(`planted schema errors found by the expected check: ${schemaErrors} of ${schemaErrors}`);
    expect(run.stdout).toMatch(/time {3}\d+(\.\d)? s: data/);
    expect(run.stdout).toContain('not verdicts');
  }, 120_000);
});
