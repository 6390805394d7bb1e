import { createHash } from 'node:crypto';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { afterAll, describe, expect, it } from 'vitest';
import { GraphBuilder } from '../../src/graph/store.js';
import { readGraph, readInto } from '../../src/sources/index.js';
import { triplesOf } from './helpers.js';

const dir = mkdtempSync(join(os.tmpdir(), 'plumb-input-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('inputs', () => {
  it('reads .gz transparently, and recognises gzip by its bytes whatever the name', async () => {
    const plain = readFileSync('fixtures/syntax/people.nt');
    const gz = join(dir, 'people.nt.gz');
    writeFileSync(gz, gzipSync(plain));
    const misnamed = join(dir, 'people-gzipped.nt');
    writeFileSync(misnamed, gzipSync(plain));
    const expected = triplesOf((await readGraph(['fixtures/syntax/people.nt'])).graph);
    for (const path of [gz, misnamed]) {
      const r = await readGraph([path]);
      expect(triplesOf(r.graph)).toEqual(expected);
      // Size and hash are those of the bytes as stored.
      const stored = readFileSync(path);
      expect(r.inputs[0]).toMatchObject({
        bytes: stored.length,
        sha256: createHash('sha256').update(stored).digest('hex'),
      });
    }
  });

  it('merges reads into one builder: the second read counts duplicates against the first', async () => {
    const builder = new GraphBuilder();
    const base = await readInto(builder, ['fixtures/syntax/people.nt']);
    const incoming = await readInto(builder, ['fixtures/syntax/people.ttl']);
    expect(base.accounting.duplicates).toBe(0);
    expect(incoming.accounting.duplicates).toBe(base.accounting.accepted);
    expect(incoming.accounting.accepted).toBe(1);
    const graph = builder.build();
    expect(graph.size).toBe(base.accounting.accepted + 1);
    // The one new triple is attributed to the second file and the line of its closing ".".
    expect(graph.provenance.files[graph.provenance.file[graph.size - 1]!]).toBe('fixtures/syntax/people.ttl');
    expect(graph.provenance.line[graph.size - 1]).toBe(14);
  });

  it('refuses no inputs, and standard input twice', async () => {
    await expect(readGraph([])).rejects.toThrow(/no input files/);
    await expect(readGraph(['-', '-'], { format: 'ntriples' })).rejects.toThrow(/only once/);
  });

  it('reports progress as bytes read', async () => {
    const events: { done: number; total?: number }[] = [];
    await readGraph(['fixtures/syntax/people.nt'], { progress: (e) => events.push(e) });
    const size = readFileSync('fixtures/syntax/people.nt').length;
    expect(events.at(-1)).toMatchObject({
      phase: 'read',
      done: size,
      total: size,
      detail: 'fixtures/syntax/people.nt',
    });
  });
});
