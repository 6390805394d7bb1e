import { describe, expect, it } from 'vitest';
import { EdgeLayout } from '../../src/model/edges.js';
import { Random } from '../../src/model/random.js';
import { NegativeSampler } from '../../src/model/sampler.js';

// Triples (s, r, o): predicate 0 goes from {0, 1, 2} to {10, 11}; predicate 1 from {3} to {12, 13, 14}.
const S = Int32Array.of(0, 1, 2, 0, 3, 3, 3);
const R = Int32Array.of(0, 0, 0, 0, 1, 1, 1);
const O = Int32Array.of(10, 11, 10, 11, 12, 13, 14);
const ALL = Int32Array.from({ length: S.length }, (_, i) => i);

describe('NegativeSampler', () => {
  it('corrupts one side of each positive, about half subjects and half objects', () => {
    const sampler = new NegativeSampler(20, 'uniform', S, R, O, 2);
    const batch = sampler.batch(S, R, O, ALL, 200, new Random(1));
    expect(batch.entity.length).toBe(7 * 200);
    expect(Array.from(batch.s)).toEqual(Array.from(S));
    let objectSide = 0;
    batch.anchor.forEach((a, j) => {
      const positive = Math.floor(j / 200);
      expect(a === positive || a === positive + 7).toBe(true);
      if (a < 7) objectSide++;
    });
    expect(objectSide / batch.anchor.length).toBeGreaterThan(0.45);
    expect(objectSide / batch.anchor.length).toBeLessThan(0.55);
    // Uniform: replacements cover the entity range.
    expect(new Set(batch.entity).size).toBe(20);
  });

  it('typed: replacements come from the entities seen in that position of that predicate', () => {
    const sampler = new NegativeSampler(20, 'typed', S, R, O, 2);
    const batch = sampler.batch(S, R, O, ALL, 50, new Random(2));
    batch.entity.forEach((e, j) => {
      const positive = Math.floor(j / 50);
      const objectSide = batch.anchor[j]! < 7;
      const allowed = R[positive] === 0 ? (objectSide ? [10, 11] : [0, 1, 2]) : objectSide ? [12, 13, 14] : null;
      // Predicate 1 has a single subject: no typed alternative, so the draw falls back to uniform.
      if (allowed !== null) expect(allowed).toContain(e);
    });
  });

  it('is repeatable under a seed', () => {
    const sampler = new NegativeSampler(20, 'uniform', S, R, O, 2);
    const a = sampler.batch(S, R, O, ALL, 10, new Random(9));
    const b = sampler.batch(S, R, O, ALL, 10, new Random(9));
    expect(Array.from(a.entity)).toEqual(Array.from(b.entity));
    expect(Array.from(a.anchor)).toEqual(Array.from(b.anchor));
  });
});

describe('EdgeLayout', () => {
  it('lays out each triple as an edge and its inverse, grouped into (type, target) pairs', () => {
    const layout = new EdgeLayout(S, R, O, 20, 2);
    const g = layout.build(null);
    expect(g.edgeCount).toBe(14);
    expect(g.typeCount).toBe(4);
    // Pairs are in (type, target) order; each pair's sources are N_i^r and its scale is 1/|N_i^r|.
    const pairs: string[] = [];
    for (let p = 0; p < g.pairCount; p++) {
      const sources: number[] = [];
      for (let e = 0; e < g.edgeCount; e++) if (g.edgePair[e] === p) sources.push(g.edgeSrc[e]!);
      pairs.push(`${g.pairType[p]}:${g.pairTarget[p]}<-${sources.sort((a, b) => a - b).join(',')}`);
      expect(g.pairScale[p]).toBeCloseTo(1 / sources.length, 7);
    }
    expect(pairs).toEqual(['0:10<-0,2', '0:11<-0,1', '1:12<-3', '1:13<-3', '1:14<-3', '2:0<-10,11', '2:1<-11', '2:2<-10', '3:3<-12,13,14']);
    expect(Array.from(g.typeOffsets)).toEqual([0, 2, 5, 8, 9]);
    // The target-ordered and source-ordered indexes are sorted, as the segment reductions need.
    for (let k = 1; k < g.pairCount; k++) expect(g.byTargetTarget[k]!).toBeGreaterThanOrEqual(g.byTargetTarget[k - 1]!);
    for (let k = 1; k < g.edgeCount; k++) expect(g.bySourceSource[k]!).toBeGreaterThanOrEqual(g.bySourceSource[k - 1]!);
  });

  it('keeps only the triples asked for', () => {
    const keep = Uint8Array.of(1, 0, 1, 0, 0, 1, 0);
    const g = new EdgeLayout(S, R, O, 20, 2).build(keep);
    expect(g.edgeCount).toBe(6);
    expect(Array.from(g.pairTarget)).toEqual([10, 13, 0, 2, 3]);
  });
});
