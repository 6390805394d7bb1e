import { describe, expect, it } from 'vitest';
import { PlumbError } from '../../src/errors.js';
import { readGraph } from '../../src/sources/index.js';
import { countsAddUp, readText, triplesOf } from './helpers.js';

const PREFIXES = '@prefix ex: <http://example.org/> .\n@prefix xsd: <http://www.w3.org/2001/XMLSchema#> .\n';

describe('Turtle', () => {
  it('reads prefixed names, lists, blank node property lists and numbers', async () => {
    const text = `${PREFIXES}ex:a ex:p ex:b , ex:c ; ex:q [ ex:r 1.5 ] ; ex:list ( ex:x ex:y ) .\n`;
    const r = await readText(text, 'turtle');
    expect(r.accounting).toMatchObject({ read: 9, accepted: 9, rejected: 0 });
    const t = triplesOf(r.graph);
    expect(t).toContain('<http://example.org/a> <http://example.org/p> <http://example.org/c>');
    expect(t.some((x) => x.endsWith('"1.5"^^<http://www.w3.org/2001/XMLSchema#decimal>'))).toBe(true);
    // Unlabelled blank nodes get keys no label can produce, distinct per file.
    expect(t.filter((x) => x.includes('_:f0-')).length).toBeGreaterThan(0);
  });

  it('resolves relative IRIs against @base, and against the file by default', async () => {
    const r = await readGraph(['fixtures/syntax/people.ttl']);
    const t = triplesOf(r.graph);
    expect(t).toContain(
      '<http://example.org/circle/member/mirel> <http://example.org/circle/knows> <http://example.org/circle/member/tavi>',
    );
    const noBase = await readText('<a> <p> <b> .\n', 'turtle', { baseIri: 'http://base.example/dir/' });
    expect(triplesOf(noBase.graph)).toEqual([
      '<http://base.example/dir/a> <http://base.example/dir/p> <http://base.example/dir/b>',
    ]);
  });

  it('gives each triple the line of the token that completed it', async () => {
    const text = `${PREFIXES}ex:a ex:p ex:b ;\n  ex:q ex:c ,\n    ex:d .\n`;
    const r = await readText(text, 'turtle');
    expect(Array.from(r.graph.provenance.line)).toEqual([3, 4, 5]);
  });

  it('recovers after a broken statement: resumes after the next line ending a statement, prefixes kept', async () => {
    const text = [
      '@prefix ex: <http://example.org/> .',
      'ex:a ex:p ex:b .',
      'ex:a ex:p "unterminated ;',
      '   ex:q ex:c .',
      'ex:d ex:p ex:e .',
      'ex:f ex:p ex:g ex:h .',
      'ex:i ex:p ex:j .',
      '',
    ].join('\n');
    const r = await readText(text, 'turtle');
    expect(countsAddUp(r)).toBe(true);
    expect(r.rejections.map((x) => x.line)).toEqual([3, 6]);
    expect(triplesOf(r.graph)).toEqual([
      '<http://example.org/a> <http://example.org/p> <http://example.org/b>',
      '<http://example.org/d> <http://example.org/p> <http://example.org/e>',
      '<http://example.org/i> <http://example.org/p> <http://example.org/j>',
    ]);
  });

  it('keeps the triples of a statement completed before its error', async () => {
    const text = `${PREFIXES}ex:a ex:p ex:b ;\n  ex:q ex:c ;\n  ex:r .\nex:s ex:p ex:o .\n`;
    const r = await readText(text, 'turtle');
    expect(r.accounting).toMatchObject({ read: 4, accepted: 3, rejected: 1 });
    expect(r.rejections[0]).toMatchObject({ line: 5, column: 8 });
    expect(r.rejections[0]!.reason).toMatch(/statement from line 3/);
  });

  it('reports an undefined prefix with its position', async () => {
    const r = await readText(
      '@prefix ex: <http://example.org/> .\nex:a nope:p ex:b .\nex:a ex:p ex:b .\n',
      'turtle',
    );
    expect(r.rejections).toHaveLength(1);
    expect(r.rejections[0]).toMatchObject({ line: 2, column: 6 });
    expect(r.rejections[0]!.reason).toMatch(/Undefined prefix "nope:"/);
    expect(r.graph.size).toBe(1);
  });

  it('recovers across batches: a long broken statement is skipped to its end', async () => {
    const filler = Array.from({ length: 3000 }, (_, i) => `  ex:p${i} "value ${i}" ;`).join('\n');
    const text = `${PREFIXES}ex:s ex:q ex:o .\nex:broken ex:p ex:o ex:extra ;\n${filler}\n  ex:last "v" .\nex:after ex:p ex:o .\n`;
    const r = await readText(text, 'turtle');
    expect(r.accounting).toMatchObject({ rejected: 1, accepted: 2 });
    expect(triplesOf(r.graph)[1]).toBe(
      '<http://example.org/after> <http://example.org/p> <http://example.org/o>',
    );
  });

  it('stops at the first error under --strict', async () => {
    const error = await readText(`${PREFIXES}ex:a ex:p .\n`, 'turtle', { strict: true }).catch(
      (e: unknown) => e,
    );
    expect(error).toBeInstanceOf(PlumbError);
    expect((error as PlumbError).position).toMatchObject({ line: 3 });
  });
});

describe('TriG', () => {
  it('reads default and named graph blocks', async () => {
    const text = `${PREFIXES}ex:a ex:p ex:b .\nex:g { ex:a ex:p ex:c . ex:a ex:p ex:d }\nGRAPH ex:h { ex:a ex:p ex:b . }\n`;
    const r = await readText(text, 'trig');
    expect(r.accounting).toMatchObject({ read: 4, accepted: 4 });
    expect(Array.from(r.graph.g).map((g) => (g < 0 ? '-' : r.graph.terms.key(g)))).toEqual([
      '-',
      'http://example.org/g',
      'http://example.org/g',
      'http://example.org/h',
    ]);
  });

  it('skips the rest of a graph block after an error inside it, so nothing lands in the wrong graph', async () => {
    const text = [
      '@prefix ex: <http://example.org/> .',
      'ex:g {',
      '  ex:a ex:p ex:b .',
      '  ex:a ex:p .',
      '  ex:c ex:p ex:d .',
      '}',
      'ex:e ex:p ex:f .',
      '',
    ].join('\n');
    const r = await readText(text, 'trig');
    expect(countsAddUp(r)).toBe(true);
    expect(r.rejections.map((x) => x.line)).toEqual([4]);
    const graphs = Array.from(r.graph.g).map((g) => (g < 0 ? '-' : r.graph.terms.key(g)));
    expect(triplesOf(r.graph).map((t, i) => `${t} @${graphs[i]}`)).toEqual([
      '<http://example.org/a> <http://example.org/p> <http://example.org/b> <http://example.org/g> @http://example.org/g',
      '<http://example.org/e> <http://example.org/p> <http://example.org/f> @-',
    ]);
  });
});
