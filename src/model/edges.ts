/**
 * The edges R-GCN passes messages along, laid out for segment reductions.
 *
 * Every model triple (s, r, o) gives two directed edges: s → o of relation type r, and o → s of the
 * inverse type r + R. Edges are sorted by (relation type, target); each run of equal (type, target)
 * is a *pair* (i, r) whose sources are N_i^r, so a segment mean over a pair's sources is exactly
 * (1/c_{i,r}) Σ_{j ∈ N_i^r} h_j. Pairs are then summed into their targets through a second index
 * (pairs ordered by target), and gradients flow back to sources through a third (edges ordered by
 * source). All three are plain integer arrays; only they reach the model.
 */
export interface MessageGraph {
  readonly entityCount: number;
  /** Relation types, inverses included: 2R. */
  readonly typeCount: number;
  readonly edgeCount: number;
  readonly pairCount: number;
  /** Source entity of each edge, edges in (type, target) order. */
  readonly edgeSrc: Int32Array;
  /** Pair of each edge (non-decreasing). */
  readonly edgePair: Int32Array;
  /** Relation type of each pair (non-decreasing). */
  readonly pairType: Int32Array;
  /** Target entity of each pair. */
  readonly pairTarget: Int32Array;
  /** 1 / c_{i,r} of each pair. */
  readonly pairScale: Float32Array;
  /** Pairs of type r are pairs typeOffsets[r] .. typeOffsets[r + 1]. */
  readonly typeOffsets: Int32Array;
  /** Pair indexes ordered by target (stable) and the targets in that order. */
  readonly byTargetPair: Int32Array;
  readonly byTargetTarget: Int32Array;
  /** For edges ordered by source (stable): the edge's pair and the source. */
  readonly bySourcePair: Int32Array;
  readonly bySourceSource: Int32Array;
}

/** Sorts the candidate edges of a set of triples once; {@link build} then keeps any subset in order. */
export class EdgeLayout {
  readonly entityCount: number;
  readonly typeCount: number;
  /** Candidate edges in (type, target) order: triple, source, target, type. */
  private readonly triple: Int32Array;
  private readonly src: Int32Array;
  private readonly dst: Int32Array;
  private readonly type: Int32Array;

  constructor(s: Int32Array, r: Int32Array, o: Int32Array, entityCount: number, relationCount: number) {
    this.entityCount = entityCount;
    this.typeCount = 2 * relationCount;
    const m = s.length;
    const n = 2 * m;
    // Edge e < m is triple e forwards; e ≥ m is triple e − m inverted.
    const edgeType = (e: number): number => (e < m ? r[e]! : r[e - m]! + relationCount);
    const edgeDst = (e: number): number => (e < m ? o[e]! : s[e - m]!);
    const edgeSrc = (e: number): number => (e < m ? s[e]! : o[e - m]!);
    // Two stable counting sorts: by target, then by type.
    const byDst = countingOrder(n, entityCount, edgeDst, null);
    const order = countingOrder(n, this.typeCount, edgeType, byDst);
    this.triple = new Int32Array(n);
    this.src = new Int32Array(n);
    this.dst = new Int32Array(n);
    this.type = new Int32Array(n);
    for (let k = 0; k < n; k++) {
      const e = order[k]!;
      this.triple[k] = e < m ? e : e - m;
      this.src[k] = edgeSrc(e);
      this.dst[k] = edgeDst(e);
      this.type[k] = edgeType(e);
    }
  }

  /** The message graph over the triples with `keep[t]` set (all when `keep` is null). */
  build(keep: Uint8Array | null): MessageGraph {
    const total = this.triple.length;
    let edgeCount = 0;
    if (keep === null) edgeCount = total;
    else for (let k = 0; k < total; k++) edgeCount += keep[this.triple[k]!]!;
    const edgeSrc = new Int32Array(edgeCount);
    const edgePair = new Int32Array(edgeCount);
    const pairTypeTmp = new Int32Array(edgeCount);
    const pairTargetTmp = new Int32Array(edgeCount);
    const pairSize = new Int32Array(edgeCount);
    let pairCount = 0;
    let lastType = -1;
    let lastDst = -1;
    let e = 0;
    for (let k = 0; k < total; k++) {
      if (keep !== null && !keep[this.triple[k]!]) continue;
      const type = this.type[k]!;
      const dst = this.dst[k]!;
      if (type !== lastType || dst !== lastDst) {
        pairTypeTmp[pairCount] = type;
        pairTargetTmp[pairCount] = dst;
        pairCount++;
        lastType = type;
        lastDst = dst;
      }
      edgeSrc[e] = this.src[k]!;
      edgePair[e] = pairCount - 1;
      pairSize[pairCount - 1]!++;
      e++;
    }
    const pairType = pairTypeTmp.slice(0, pairCount);
    const pairTarget = pairTargetTmp.slice(0, pairCount);
    const pairScale = new Float32Array(pairCount);
    for (let p = 0; p < pairCount; p++) pairScale[p] = 1 / pairSize[p]!;
    const typeOffsets = new Int32Array(this.typeCount + 1);
    for (let p = 0; p < pairCount; p++) typeOffsets[pairType[p]! + 1]!++;
    for (let t = 0; t < this.typeCount; t++) typeOffsets[t + 1]! += typeOffsets[t]!;
    const byTargetPair = countingOrder(pairCount, this.entityCount, (p) => pairTarget[p]!, null);
    const byTargetTarget = new Int32Array(pairCount);
    for (let k = 0; k < pairCount; k++) byTargetTarget[k] = pairTarget[byTargetPair[k]!]!;
    const bySource = countingOrder(edgeCount, this.entityCount, (k) => edgeSrc[k]!, null);
    const bySourcePair = new Int32Array(edgeCount);
    const bySourceSource = new Int32Array(edgeCount);
    for (let k = 0; k < edgeCount; k++) {
      bySourcePair[k] = edgePair[bySource[k]!]!;
      bySourceSource[k] = edgeSrc[bySource[k]!]!;
    }
    return {
      entityCount: this.entityCount,
      typeCount: this.typeCount,
      edgeCount,
      pairCount,
      edgeSrc,
      edgePair,
      pairType,
      pairTarget,
      pairScale,
      typeOffsets,
      byTargetPair,
      byTargetTarget,
      bySourcePair,
      bySourceSource,
    };
  }
}

/**
 * Stable counting sort: the positions 0..n−1 (or `within`, an order to refine) ordered by `key`,
 * whose values lie in [0, buckets).
 */
export function countingOrder(n: number, buckets: number, key: (i: number) => number, within: Int32Array | null): Int32Array {
  const counts = new Int32Array(buckets + 1);
  for (let i = 0; i < n; i++) counts[key(i) + 1]!++;
  for (let b = 0; b < buckets; b++) counts[b + 1]! += counts[b]!;
  const out = new Int32Array(n);
  for (let k = 0; k < n; k++) {
    const i = within === null ? k : within[k]!;
    out[counts[key(i)]!++] = i;
  }
  return out;
}
