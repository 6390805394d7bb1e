import { describe, expect, it } from 'vitest';
import { PlumbError } from '../../src/errors.js';
import { GraphBuilder } from '../../src/graph/store.js';
import { readGraph, readInto } from '../../src/sources/index.js';
import { countsAddUp, readText, triplesOf } from './helpers.js';

const A = '<http://example.org/a>';
const P = '<http://example.org/p>';
const B = '<http://example.org/b>';
const C = '<http://example.org/c>';

describe('N-Triples', () => {
  it('reads triples, drops duplicates and accounts for every statement', async () => {
    const text = [`${A} ${P} ${B} .`, `${A} ${P} ${C} .`, `${A} ${P} ${B} .`, ''].join('\n');
    const r = await readText(text, 'ntriples');
    expect(r.accounting).toEqual({ read: 3, accepted: 2, duplicates: 1, rejected: 0 });
    expect(triplesOf(r.graph)).toEqual([`${A} ${P} ${B}`, `${A} ${P} ${C}`]);
    expect(r.inputs[0]).toMatchObject({ path: '-', format: 'ntriples', statements: 3 });
  });

  it('treats CRLF, a BOM, blank lines and comments as ordinary input', async () => {
    const text = `\ufeff# a comment\r\n\r\n${A} ${P} ${B} . # trailing comment\r\n   \r\n${A} ${P} "x" .\r\n`;
    const r = await readText(text, 'ntriples');
    expect(r.accounting).toEqual({ read: 2, accepted: 2, duplicates: 0, rejected: 0 });
    expect(Array.from(r.graph.provenance.line)).toEqual([3, 5]);
  });

  it('keeps reading after a malformed line and says where and why', async () => {
    const text = [
      `${A} ${P} ${B} .`,
      `${A} <http://example.org/p ${C} .`, // unterminated IRI
      `${A} ${P} ${C}`, // no final dot
      `${B} ${P} ${C} .`,
      `${B} ${P} "open .`, // unterminated literal
      `${C} ${P} ${A} .`,
    ].join('\n');
    const r = await readText(text, 'ntriples');
    expect(r.accounting).toEqual({ read: 6, accepted: 3, duplicates: 0, rejected: 3 });
    expect(countsAddUp(r)).toBe(true);
    expect(r.rejections.map((x) => [x.line, x.column])).toEqual([
      [2, 24],
      [3, `${A} ${P} ${C}`.length + 1],
      [5, 47],
    ]);
    expect(r.rejections[0]!.reason).toMatch(/unterminated IRI/);
    expect(r.rejections[0]!.text).toBe(`${A} <http://example.org/p ${C} .`);
    expect(r.rejections[1]!.reason).toMatch(/punctuation/);
    expect(r.rejections[2]!.reason).toMatch(/unterminated or malformed string/);
    expect(r.rejections.every((x) => x.file === '-')).toBe(true);
    expect(Array.from(r.graph.provenance.line)).toEqual([1, 4, 6]);
  });

  it('keeps the line before one that breaks at its very first character', async () => {
    const r = await readText(
      `${A} ${P} ${B} .\n<http://example.org/x ${P} ${C} .\n${B} ${P} ${C} .\n`,
      'ntriples',
    );
    expect(r.rejections.map((x) => [x.line, x.column])).toEqual([[2, 1]]);
    expect(triplesOf(r.graph)).toEqual([`${A} ${P} ${B}`, `${B} ${P} ${C}`]);
  });

  it('stops at the first malformed line under --strict with file:line:column', async () => {
    const text = `${A} ${P} ${B} .\n${A} ${P} ${C} ${C} .\n${A} ${P} ${C} .\n`;
    const error = await readText(text, 'ntriples', { strict: true }).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(PlumbError);
    const e = error as PlumbError;
    expect(e.exitCode).toBe(2);
    expect(e.position).toEqual({ file: '-', line: 2, column: `${A} ${P} ${C} `.length + 1 });
    expect(e.message).not.toMatch(/\n/);
  });

  it('makes blank nodes distinct per file and consistent within one', async () => {
    const builder = new GraphBuilder();
    await readInto(builder, ['-'], {
      format: 'ntriples',
      stdin: (await import('node:stream')).Readable.from([`_:x ${P} _:y .\n_:x ${P} ${B} .\n`]),
    });
    await readInto(builder, ['-'], {
      format: 'ntriples',
      stdin: (await import('node:stream')).Readable.from([`_:x ${P} _:y .\n`]),
    });
    const g = builder.build();
    expect(g.size).toBe(3);
    const keys = triplesOf(g);
    const [first, second, third] = keys.map((k) => k.split(' ')[0]);
    expect(first).toBe(second);
    expect(third).not.toBe(first);
    expect(g.provenance.files).toEqual(['-', '-']);
    expect(Array.from(g.provenance.file)).toEqual([0, 0, 1]);
  });

  it('reads literals with escapes, language tags and datatypes into canonical keys', async () => {
    const text = [
      `${A} ${P} "tab\\there \\"quoted\\" \\u00E9\\U0001F600" .`,
      `${A} ${P} "chat"@FR .`,
      `${A} ${P} "5"^^<http://www.w3.org/2001/XMLSchema#integer> .`,
      `${A} ${P} "plain"^^<http://www.w3.org/2001/XMLSchema#string> .`,
    ].join('\n');
    const r = await readText(text, 'ntriples');
    const objects = triplesOf(r.graph).map((t) => t.slice(`${A} ${P} `.length));
    expect(objects).toEqual([
      '"tab\there \\"quoted\\" é😀"',
      '"chat"@fr',
      '"5"^^<http://www.w3.org/2001/XMLSchema#integer>',
      '"plain"',
    ]);
  });
});

describe('N-Quads', () => {
  it('keeps the graph name and tells quads in different graphs apart', async () => {
    const G = '<http://example.org/g>';
    const text = `${A} ${P} ${B} ${G} .\n${A} ${P} ${B} .\n${A} ${P} ${B} ${G} .\n${A} ${P} ${B} _:g .\n`;
    const r = await readText(text, 'nquads');
    expect(r.accounting).toMatchObject({ read: 4, accepted: 3, duplicates: 1 });
    expect(Array.from(r.graph.g).map((g) => (g < 0 ? '' : r.graph.terms.key(g)))).toEqual([
      'http://example.org/g',
      '',
      '_:f0_g',
    ]);
  });

  it('rejects a quad with five terms and goes on', async () => {
    const text = `${A} ${P} ${B} ${C} ${C} .\n${A} ${P} ${C} .\n`;
    const r = await readText(text, 'nquads');
    expect(r.accounting).toMatchObject({ read: 2, accepted: 1, rejected: 1 });
    expect(r.rejections[0]!.line).toBe(1);
  });
});

describe('several inputs', () => {
  it('merges files into one graph and records which file each triple came from', async () => {
    const r = await readGraph(['fixtures/syntax/people.nt', 'fixtures/syntax/people.ttl']);
    expect(r.inputs.map((i) => [i.path, i.format])).toEqual([
      ['fixtures/syntax/people.nt', 'ntriples'],
      ['fixtures/syntax/people.ttl', 'turtle'],
    ]);
    expect(r.inputs.every((i) => /^[0-9a-f]{64}$/.test(i.sha256) && i.bytes > 0)).toBe(true);
    // The Turtle file says the same as the N-Triples file, plus one triple.
    expect(r.accounting.duplicates).toBe(r.inputs[0]!.statements);
    expect(r.graph.size).toBe(r.inputs[0]!.statements + 1);
    expect(r.graph.provenance.files).toEqual(['fixtures/syntax/people.nt', 'fixtures/syntax/people.ttl']);
    expect(countsAddUp(r)).toBe(true);
  });
});
