import type { ScoredBatch } from './distmult.js';
import type { Random } from './random.js';

/**
 * Negative sampling (Bordes et al. 2013; Schlichtkrull et al. 2018 §4): each positive (s, r, o) gets
 * k corruptions, each replacing the subject or the object (a fair coin) with a sampled entity.
 * - `uniform`: the replacement is any entity;
 * - `typed`: an entity seen in that position of that predicate in the training triples (its observed
 *   domain or range), so negatives are type-plausible but wrong — what schema checks cannot catch.
 *   Where a predicate has a single entity in that position, the draw falls back to uniform.
 * Negatives are not checked against known triples (common practice: a rare false negative costs
 * less than the lookup).
 */
export class NegativeSampler {
  private readonly domainOffsets: Int32Array;
  private readonly domain: Int32Array;
  private readonly rangeOffsets: Int32Array;
  private readonly range: Int32Array;

  constructor(
    private readonly entityCount: number,
    private readonly mode: 'uniform' | 'typed',
    s: Int32Array,
    r: Int32Array,
    o: Int32Array,
    relationCount: number,
  ) {
    [this.domainOffsets, this.domain] = mode === 'typed' ? distinctByRelation(s, r, relationCount) : [new Int32Array(1), new Int32Array(0)];
    [this.rangeOffsets, this.range] = mode === 'typed' ? distinctByRelation(o, r, relationCount) : [new Int32Array(1), new Int32Array(0)];
  }

  /** Positives `index[from..to)` of (s, r, o) with `k` negatives each. */
  batch(s: Int32Array, r: Int32Array, o: Int32Array, index: Int32Array, k: number, random: Random): ScoredBatch {
    const b = index.length;
    const bs = new Int32Array(b);
    const br = new Int32Array(b);
    const bo = new Int32Array(b);
    for (let i = 0; i < b; i++) {
      const t = index[i]!;
      bs[i] = s[t]!;
      br[i] = r[t]!;
      bo[i] = o[t]!;
    }
    const entity = new Int32Array(b * k);
    const anchor = new Int32Array(b * k);
    for (let i = 0; i < b; i++) {
      for (let j = 0; j < k; j++) {
        const n = i * k + j;
        const object = random.next() < 0.5;
        anchor[n] = object ? i : b + i;
        entity[n] = this.draw(br[i]!, object, random);
      }
    }
    return { s: bs, r: br, o: bo, entity, anchor };
  }

  private draw(relation: number, object: boolean, random: Random): number {
    if (this.mode === 'typed') {
      const offsets = object ? this.rangeOffsets : this.domainOffsets;
      const start = offsets[relation]!;
      const n = offsets[relation + 1]! - start;
      if (n > 1) return (object ? this.range : this.domain)[start + random.int(n)]!;
    }
    return random.int(this.entityCount);
  }
}

/** The distinct entities of `column` per relation, as CSR (offsets over relations). */
function distinctByRelation(column: Int32Array, r: Int32Array, relationCount: number): [Int32Array, Int32Array] {
  const seen = new Set<number>();
  const byRelation: number[][] = Array.from({ length: relationCount }, () => []);
  for (let t = 0; t < column.length; t++) {
    const key = r[t]! * 0x100000000 + column[t]!;
    if (seen.has(key)) continue;
    seen.add(key);
    byRelation[r[t]!]!.push(column[t]!);
  }
  const offsets = new Int32Array(relationCount + 1);
  for (let i = 0; i < relationCount; i++) offsets[i + 1] = offsets[i]! + byRelation[i]!.length;
  const values = new Int32Array(offsets[relationCount]!);
  for (let i = 0; i < relationCount; i++) values.set(byRelation[i]!.sort((a, b) => a - b), offsets[i]!);
  return [offsets, values];
}
