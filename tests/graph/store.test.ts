import { describe, expect, it } from 'vitest';
import { GraphBuilder, graphFromKeys, row } from '../../src/graph/store.js';
import { literalKey, literalParts, termKind, TermKind } from '../../src/graph/terms.js';

describe('GraphBuilder', () => {
  it('drops exact duplicates and counts them', () => {
    const b = new GraphBuilder();
    const f = b.addFile('a.nt');
    expect(b.addKeys('http://x/a', 'http://x/p', 'http://x/b', undefined, f, 1)).toBe(true);
    expect(b.addKeys('http://x/a', 'http://x/p', 'http://x/b', undefined, f, 2)).toBe(false);
    expect(b.addKeys('http://x/a', 'http://x/p', 'http://x/b', 'http://x/g', f, 3)).toBe(true);
    expect(b.duplicates).toBe(1);
    const g = b.build();
    expect(g.size).toBe(2);
    expect(Array.from(g.provenance.line)).toEqual([1, 3]);
  });

  it('keeps every triple through many rehashes', () => {
    const b = new GraphBuilder();
    for (let i = 0; i < 20_000; i++) b.addKeys(`http://x/${i % 977}`, `http://x/p${i % 7}`, `http://x/${i}`);
    for (let i = 0; i < 20_000; i += 3)
      b.addKeys(`http://x/${i % 977}`, `http://x/p${i % 7}`, `http://x/${i}`);
    expect(b.size).toBe(20_000);
    expect(b.duplicates).toBe(6667);
  });

  it('freezes into arrays of exactly the triple count, dropping the growth room', () => {
    const b = new GraphBuilder();
    for (let i = 0; i < 3000; i++) b.addKeys(`http://x/${i}`, 'http://x/p', `http://x/${i + 1}`);
    const g = b.build();
    for (const column of [g.s, g.p, g.o, g.g]) expect(column.byteLength).toBe(3000 * 4);
    expect(g.provenance.file.byteLength).toBe(3000 * 2);
    expect(g.provenance.line.byteLength).toBe(3000 * 4);
    expect(g.bySubject.triples.byteLength).toBe(3000 * 4);
  });

  it('reserves room in advance and still drops duplicates and spare room', () => {
    const b = new GraphBuilder();
    b.addKeys('http://x/a', 'http://x/p', 'http://x/b');
    b.reserve(50_000);
    for (let i = 0; i < 100; i++) b.addKeys('http://x/a', 'http://x/p', `http://x/${i % 10}`);
    expect(b.size).toBe(11);
    expect(b.duplicates).toBe(90);
    const g = b.build();
    expect(g.s.byteLength).toBe(11 * 4);
  });

  it('indexes triples by subject, object and predicate', () => {
    const g = graphFromKeys([
      ['http://x/a', 'http://x/p', 'http://x/b'],
      ['http://x/b', 'http://x/p', 'http://x/c'],
      ['http://x/a', 'http://x/q', 'http://x/c'],
    ]);
    const a = g.terms.id('http://x/a');
    const c = g.terms.id('http://x/c');
    const p = g.terms.id('http://x/p');
    expect(Array.from(row(g.bySubject, a))).toEqual([0, 2]);
    expect(Array.from(row(g.byObject, c))).toEqual([1, 2]);
    expect(Array.from(row(g.byPredicate, p))).toEqual([0, 1]);
  });
});

describe('term keys', () => {
  it('round-trips literals with escapes, language tags and datatypes', () => {
    const k = literalKey('say "hi"\n\\', 'http://www.w3.org/2001/XMLSchema#string');
    expect(k).toBe('"say \\"hi\\"\\n\\\\"');
    expect(literalParts(k).lexical).toBe('say "hi"\n\\');
    expect(literalParts(literalKey('chat', undefined, 'FR'))).toMatchObject({ language: 'fr' });
    expect(termKind('_:b1')).toBe(TermKind.Blank);
    expect(termKind(k)).toBe(TermKind.Literal);
    expect(termKind('http://x/a')).toBe(TermKind.Iri);
  });
});
