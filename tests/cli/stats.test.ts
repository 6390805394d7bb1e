import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { runCli } from '../helpers/cli.js';

const dir = mkdtempSync(join(os.tmpdir(), 'plumb-stats-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const MIXED = [
  '<http://example.org/a> <http://example.org/p> <http://example.org/b> .',
  '<http://example.org/a> <http://example.org/p> <http://example.org/b> .',
  '<http://example.org/a> <http://example.org/p "x" .',
  '<http://example.org/b> <http://www.w3.org/2000/01/rdf-schema#label> "Bee" .',
  '',
].join('\n');

describe('plumb stats', () => {
  it('--json prints the accounting, the profile and every rejection', async () => {
    const path = join(dir, 'mixed.nt');
    writeFileSync(path, MIXED);
    const run = await runCli(['stats', path, '--json']);
    expect(run.exitCode).toBe(0);
    const out = JSON.parse(run.stdout) as Record<string, unknown>;
    expect(out).toMatchObject({
      read: 4,
      triples: 2,
      duplicates: 1,
      rejected: 1,
      entities: 2,
      predicates: 2,
      literals: 1,
    });
    expect(out.rejections).toEqual([
      expect.objectContaining({
        file: path,
        line: 3,
        column: 24,
        reason: expect.stringMatching(/unterminated IRI/) as unknown,
      }),
    ]);
    expect((out.inputs as { sha256: string }[])[0]!.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(run.stderr).toBe('');
  });

  it('prints a readable summary without --json', async () => {
    const run = await runCli([
      'stats',
      '../shared/datasets/nations/train.txt',
      '../shared/datasets/nations/valid.txt',
      '../shared/datasets/nations/test.txt',
    ]);
    expect(run.exitCode).toBe(0);
    expect(run.stdout).toMatch(
      /^Read 3 files: 1,992 statements = 1,992 kept \+ 0 duplicates \+ 0 rejected$/m,
    );
    expect(run.stdout).toMatch(/14 entities \(0 blank\), 55 predicates, 0 literals/);
    expect(run.stdout).toMatch(/Degree per entity: min \d+/);
    expect(run.stdout).toMatch(/… and 30 more predicates \(--json lists all\)/);
  });

  it('reads standard input with --format and CSV flags', async () => {
    const run = await runCli(
      [
        'stats',
        '-',
        '--format',
        'csv',
        '--columns',
        'to,rel,from',
        '--base-iri',
        'https://kg.example/',
        '--json',
      ],
      {
        stdin: 'from,rel,to\nb,p,a\nc,p,a\n',
      },
    );
    expect(run.exitCode).toBe(0);
    const out = JSON.parse(run.stdout) as {
      read: number;
      perPredicate: { predicate: string; subjects: number }[];
    };
    expect(out.read).toBe(2);
    expect(out.perPredicate).toEqual([
      expect.objectContaining({ predicate: 'https://kg.example/p', subjects: 1 }),
    ]);
  });

  it('exits 2 with one line naming the file when it cannot be read', async () => {
    const run = await runCli(['stats', join(dir, 'nope.nt')]);
    expect(run.exitCode).toBe(2);
    expect(run.stdout).toBe('');
    expect(run.stderr).toMatch(/^plumb: .*nope\.nt: no such file: .*nope\.nt\n {2}hint: /);
    expect(run.stderr).not.toMatch(/\n\s+at /);
  });

  it('exits 2 at the first malformed line under --strict, with file:line:column', async () => {
    const path = join(dir, 'strict.nt');
    writeFileSync(path, MIXED);
    const run = await runCli(['stats', path, '--strict']);
    expect(run.exitCode).toBe(2);
    expect(run.stderr.split('\n')[0]).toBe(
      `plumb: ${path}:3:24: unterminated IRI: Unexpected "<http://example.org/p"`,
    );
  });

  it('exits 2 on an unknown --format and on a file whose format it cannot tell', async () => {
    const bad = await runCli(['stats', 'x.nt', '--format', 'rdfxml']);
    expect(bad.exitCode).toBe(2);
    expect(bad.stderr).toMatch(/unknown format "rdfxml"/);
    const unknown = await runCli(['stats', join(dir, 'data.json')]);
    expect(unknown.exitCode).toBe(2);
    expect(unknown.stderr).toMatch(/cannot tell the format/);
  });
});
