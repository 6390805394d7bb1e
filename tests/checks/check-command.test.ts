import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { validateReport } from '../../src/report/json.js';
import type { Finding } from '../../src/findings.js';
import { runCli } from '../helpers/cli.js';

const dir = mkdtempSync(join(tmpdir(), 'plumb-check-cli-'));
const P = '@prefix ex: <http://example.org/> . @prefix rdfs: <http://www.w3.org/2000/01/rdf-schema#> . @prefix owl: <http://www.w3.org/2002/07/owl#> . @prefix sh: <http://www.w3.org/ns/shacl#> .';
writeFileSync(join(dir, 'graph.ttl'), `${P}\nex:worksFor rdfs:domain ex:Person .\nex:acme ex:worksFor ex:bob .\nex:acme a ex:Org .\n`);
writeFileSync(join(dir, 'ontology.ttl'), `${P}\nex:Person owl:disjointWith ex:Org .\n`);
writeFileSync(join(dir, 'shapes.ttl'), `${P}\nex:S sh:targetNode ex:bob ;\n  sh:property [ sh:path ex:name ; sh:minCount 1 ] .\n`);
writeFileSync(join(dir, 'broken.ttl'), `${P}\nex:a ex:b .\n`);

describe('plumb check', () => {
  it('--json prints a report whose findings carry the record fields; exit 1 on an error', async () => {
    const run = await runCli(['check', 'graph.ttl', '--schema', 'ontology.ttl', '--shapes', 'shapes.ttl', '--json'], { cwd: dir });
    expect(run.stderr).toBe('');
    expect(run.exitCode).toBe(1);
    const report = JSON.parse(run.stdout) as { findings: Finding[]; accounting: unknown; command: string };
    expect(validateReport(report)).toEqual([]);
    expect(report.command).toBe('check');
    expect(report.accounting).toEqual({ read: 3, accepted: 3, duplicates: 0, rejected: 0 });
    const [shacl] = report.findings.filter((f) => f.check === 'shacl');
    expect(shacl).toMatchObject({ kind: 'violation', severity: 'error', subject: 'http://example.org/bob', predicate: 'http://example.org/name', object: '' });
    // The domain finding: ex:acme is an ex:Org, which --schema declares disjoint with the domain ex:Person.
    const [domain] = report.findings.filter((f) => f.check === 'domain');
    expect(domain).toMatchObject({
      kind: 'violation',
      severity: 'error',
      subject: 'http://example.org/acme',
      predicate: 'http://example.org/worksFor',
      object: 'http://example.org/bob',
      source: { file: expect.stringMatching(/graph\.ttl$/) as string, line: 3 },
    });
    expect(domain!.message).toMatch(/declared disjoint/);
    expect(Object.keys(domain!.evidence)).toContain('conflicts');
  });

  it('without --schema the missing type is only a warning (open world): exit 0 under the default --fail-on error', async () => {
    const run = await runCli(['check', 'graph.ttl', '--json'], { cwd: dir });
    expect(run.exitCode).toBe(0);
    const report = JSON.parse(run.stdout) as { findings: Finding[] };
    expect(report.findings.map((f) => [f.check, f.severity])).toEqual([['domain', 'warning']]);
  });

  it('--fail-on warning and --closed-world turn the same finding into a failure', async () => {
    expect((await runCli(['check', 'graph.ttl', '--fail-on', 'warning'], { cwd: dir })).exitCode).toBe(1);
    const closed = await runCli(['check', 'graph.ttl', '--closed-world', '--json'], { cwd: dir });
    expect(closed.exitCode).toBe(1);
    expect((JSON.parse(closed.stdout) as { findings: Finding[] }).findings[0]!.severity).toBe('error');
  });

  it('the terminal summary counts findings per check and shows their messages', async () => {
    const run = await runCli(['check', 'graph.ttl', '--schema', 'ontology.ttl', '--shapes', 'shapes.ttl'], { cwd: dir });
    expect(run.stdout).toMatch(/2 findings: 2 errors, 0 warnings, 0 notes/);
    expect(run.stdout).toMatch(/domain +1 error/);
    expect(run.stdout).toMatch(/graph\.ttl:3\n +<http:\/\/example\.org\/acme> is the subject of/);
    expect(run.stdout).not.toMatch(/\u001b\[/); // no colour when not on a terminal
  });

  it('a syntax error is a finding, and --strict makes it exit 2 with file and line', async () => {
    const lenient = await runCli(['check', 'broken.ttl', '--json'], { cwd: dir });
    expect(lenient.exitCode).toBe(1);
    expect((JSON.parse(lenient.stdout) as { findings: Finding[] }).findings[0]).toMatchObject({ kind: 'syntax', source: { line: 2 } });
    const strict = await runCli(['check', 'broken.ttl', '--strict'], { cwd: dir });
    expect(strict.exitCode).toBe(2);
    expect(strict.stderr).toMatch(/broken\.ttl:2/);
  });

  it('bad input exits 2 with a message and a hint, never a stack trace', async () => {
    for (const argv of [
      ['check', 'missing.ttl'],
      ['check', 'graph.ttl', '--min-confidence', '1.5'],
      ['check', 'graph.ttl', '--min-support', '0'],
      ['check', 'graph.ttl', '--only', 'nonsense'],
      ['check', 'graph.ttl', '--fail-on', 'fatal'],
      ['check', 'graph.ttl', '--shapes', 'nowhere.ttl'],
    ]) {
      const run = await runCli(argv, { cwd: dir });
      expect(run.exitCode, argv.join(' ')).toBe(2);
      expect(run.stderr).not.toMatch(/\n\s+at /);
    }
    const unknown = await runCli(['check', 'graph.ttl', '--only', 'nonsense'], { cwd: dir });
    expect(unknown.stderr).toMatch(/there is no check "nonsense"/);
    expect(unknown.stderr).toMatch(/hint: the checks are: schema, domain/);
  });

  it('--help explains the open-world reading', async () => {
    const run = await runCli(['check', '--help']);
    expect(run.exitCode).toBe(0);
    expect(run.stdout).toMatch(/open-world/);
    expect(run.stdout).toMatch(/--closed-world/);
    expect(run.stdout).toMatch(/missing type/);
  });

  it('--only runs the named checks', async () => {
    const run = await runCli(['check', 'graph.ttl', '--schema', 'ontology.ttl', '--shapes', 'shapes.ttl', '--only', 'shacl', '--json'], { cwd: dir });
    expect((JSON.parse(run.stdout) as { findings: Finding[] }).findings.map((f) => f.check)).toEqual(['shacl']);
  });
});
