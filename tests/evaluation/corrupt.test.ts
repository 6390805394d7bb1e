import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { graphFromKeys, row, type Graph } from '../../src/graph/store.js';
import { literalKey } from '../../src/graph/terms.js';
import {
  corruptGraph,
  hasTriple,
  parseTruth,
  resourceTriples,
  truthText,
  type CorruptionKind,
} from '../../src/evaluation/corrupt.js';

const repoRoot = path.resolve(import.meta.dirname, '../..');
// Source: UMLS (Kok & Domingos 2007), train split as distributed since Dettmers et al. 2018.
const umlsRows = readFileSync(path.resolve(repoRoot, '../shared/datasets/umls/train.txt'), 'utf8')
  .trim()
  .split('\n')
  .map((l) => l.split('\t').map((x) => `http://example.org/umls/${x}`) as [string, string, string]);
const umls = graphFromKeys(umlsRows);

function tripleSet(g: Graph, upTo = g.size): Set<string> {
  const out = new Set<string>();
  for (let i = 0; i < upTo; i++) out.add(`${g.s[i]} ${g.p[i]} ${g.o[i]}`);
  return out;
}

describe('corruptGraph', () => {
  for (const kind of ['random', 'range', 'predicate'] as CorruptionKind[]) {
    it(`adds round(rate·n) fresh ${kind} errors and keeps every original`, () => {
      const { graph, injected, firstInjected } = corruptGraph(umls, { rate: 0.05, kinds: [kind], seed: 7 });
      expect(injected).toHaveLength(Math.round(0.05 * umls.size));
      expect(firstInjected).toBe(umls.size);
      expect(graph.size).toBe(umls.size + injected.length);
      for (let i = 0; i < umls.size; i++) {
        expect([graph.s[i], graph.p[i], graph.o[i]]).toEqual([umls.s[i], umls.p[i], umls.o[i]]);
      }
      const originals = tripleSet(umls);
      const seen = new Set<string>();
      injected.forEach((e, i) => {
        const key = `${e.s} ${e.p} ${e.o}`;
        expect(originals.has(key)).toBe(false);
        expect(seen.has(key)).toBe(false);
        seen.add(key);
        expect(hasTriple(umls, e.s, e.p, e.o)).toBe(false);
        expect(graph.s[firstInjected + i]).toBe(e.s);
        expect(graph.provenance.files[graph.provenance.file[firstInjected + i]!]).toBe('(injected)');
        // Only the named position changed, and it changed.
        const src = e.source;
        const before = { subject: umls.s[src]!, predicate: umls.p[src]!, object: umls.o[src]! };
        const after = { subject: e.s, predicate: e.p, object: e.o };
        for (const pos of ['subject', 'predicate', 'object'] as const) {
          if (pos === e.replaced) {
            expect(after[pos]).not.toBe(before[pos]);
            expect(e.original).toBe(before[pos]);
          } else expect(after[pos]).toBe(before[pos]);
        }
        expect(e.kind).toBe(kind);
      });
      // Each original used once.
      expect(new Set(injected.map((e) => e.source)).size).toBe(injected.length);
      if (kind !== 'predicate') {
        const subj = injected.filter((e) => e.replaced === 'subject').length;
        expect(subj).toBe(Math.floor(injected.length / 2));
      } else expect(injected.every((e) => e.replaced === 'predicate')).toBe(true);
    });
  }

  it('draws range replacements from entities seen in that position of that predicate', () => {
    const { injected } = corruptGraph(umls, { rate: 0.05, kinds: ['range'], seed: 3 });
    for (const e of injected) {
      const triples = row(umls.byPredicate, e.p);
      const column = e.replaced === 'subject' ? umls.s : umls.o;
      const value = e.replaced === 'subject' ? e.s : e.o;
      expect(triples.some((t) => column[t] === value)).toBe(true);
    }
  });

  it('draws random replacements from all entities, beyond the predicate’s range', () => {
    const { injected } = corruptGraph(umls, { rate: 0.05, kinds: ['random'], seed: 3 });
    let outside = 0;
    for (const e of injected) {
      const triples = row(umls.byPredicate, e.p);
      const column = e.replaced === 'subject' ? umls.s : umls.o;
      const value = e.replaced === 'subject' ? e.s : e.o;
      if (!triples.some((t) => column[t] === value)) outside++;
    }
    expect(outside).toBeGreaterThan(injected.length / 4);
  });

  it('shares errors evenly among kinds, and a seed repeats the same draw', () => {
    const a = corruptGraph(umls, { rate: 0.03, kinds: ['random', 'range', 'predicate'], seed: 11 });
    const b = corruptGraph(umls, { rate: 0.03, kinds: ['random', 'range', 'predicate'], seed: 11 });
    const c = corruptGraph(umls, { rate: 0.03, kinds: ['random', 'range', 'predicate'], seed: 12 });
    const counts = (k: string): number => a.injected.filter((e) => e.kind === k).length;
    expect(Math.max(counts('random'), counts('range'), counts('predicate')) - Math.min(counts('random'), counts('range'), counts('predicate'))).toBeLessThanOrEqual(1);
    expect(b.injected).toEqual(a.injected);
    expect(c.injected).not.toEqual(a.injected);
  });

  it('leaves literal-valued triples alone and fails with a hint when it cannot find enough', () => {
    const g = graphFromKeys([
      ['http://x/a', 'http://x/p', 'http://x/b'],
      ['http://x/a', 'http://x/name', literalKey('A')],
    ]);
    expect(Array.from(resourceTriples(g))).toEqual([1, 0]);
    expect(() => corruptGraph(g, { rate: 1, kinds: ['range'] })).toThrow(/could not inject/);
    expect(() => corruptGraph(g, { rate: 0, kinds: ['random'] })).toThrow(/--rate/);
  });
});

describe('truth file', () => {
  it('round-trips the injected triples, with kind, position and original term', () => {
    const { graph, injected } = corruptGraph(umls, { rate: 0.01, kinds: ['random', 'predicate'], seed: 5 });
    const entries = parseTruth(truthText(graph, injected), 'truth.tsv');
    expect(entries).toHaveLength(injected.length);
    entries.forEach((t, i) => {
      const e = injected[i]!;
      expect([t.subject, t.predicate, t.object]).toEqual([graph.terms.key(e.s), graph.terms.key(e.p), graph.terms.key(e.o)]);
      expect(t.kind).toBe(e.kind);
      expect(t.replaced).toBe(e.replaced);
      expect(t.original).toBe(graph.terms.key(e.original));
      expect(t.graph).toBeUndefined();
    });
  });

  it('keeps a literal with a tab and a quote intact, and names the line of a bad row', () => {
    const lit = literalKey('a\tb "c"', undefined, 'en');
    const g = graphFromKeys([['http://x/a', 'http://x/p', lit]]);
    const text = truthText(g, [{ s: 0, p: 1, o: 2, g: -1, kind: 'random', replaced: 'object', original: 2, source: 0 }]);
    expect(text.split('\n')[1]!.split('\t')).toHaveLength(7);
    expect(parseTruth(text, 't.tsv')[0]!.object).toBe(lit);
    expect(() => parseTruth('subject\tpredicate\tobject\n<a>\t<b>\n', 'bad.tsv')).toThrow(/3 tab-separated columns/);
    try {
      parseTruth('subject\tpredicate\tobject\n<a>\t<b>\n', 'bad.tsv');
    } catch (e) {
      expect((e as { position: unknown }).position).toEqual({ file: 'bad.tsv', line: 2 });
    }
  });
});
