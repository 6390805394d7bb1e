/**
 * Plausibility: one figure in [0, 1] per scored triple, low = suspect, comparable across predicates.
 *
 * The model's raw output is not comparable across predicates: DistMult logits have a scale of their
 * own per relation, and filtered ranks of true triples are worse for one-to-many predicates (many
 * right answers compete). So each triple is placed against the other triples *of the same predicate*,
 * all scored out-of-fold (by a model that saw none of them):
 *
 *   plausibility(t) = ( #{u ∈ P(t), u ≠ t : q(u) < q(t)} + ½ · #{u ∈ P(t), u ≠ t : q(u) = q(t)} + m · G(q(t)) )
 *                     / ( |P(t)| − 1 + m )
 *
 * where P(t) is the set of scored triples with t's predicate, q is the quality being calibrated
 * (see {@link PlausibilityBasis}), G(x) is the same share taken over all scored triples, and m (the
 * `prior`, 30 by default) pulls small predicates towards the whole graph so that the worst of three
 * triples is not called implausible on that evidence alone. For a predicate with many triples it reads:
 * "the share of this predicate's triples that the model found less plausible than this one".
 * A plausibility of 0.02 means 98% of the predicate's other triples looked better.
 */

/** What is calibrated per predicate. */
export type PlausibilityBasis =
  /** The decoder's logit f(s, p, o). */
  | 'logit'
  /** The mean of the filtered subject- and object-rank percentiles, 1 − (rank − 1)/(candidates − 1). */
  | 'rank'
  /** The mean of the two per-predicate shares above, itself placed among the predicate's triples. */
  | 'combined';
export const PLAUSIBILITY_BASES: readonly PlausibilityBasis[] = ['logit', 'rank', 'combined'];

/**
 * Ranking every triple against every entity costs about triples × entities scores (two sides): the
 * `combined` basis is used below this many, `logit` above (see {@link chooseBasis}).
 */
export const RANKING_BUDGET = 5e9;

/**
 * The basis when none is given: `combined` where ranking is affordable (it was the best on corrupted
 * UMLS and Kinship, a little above `logit`), else `logit`, which needs no ranking at all.
 */
export function chooseBasis(triples: number, entities: number): PlausibilityBasis {
  return triples * entities <= RANKING_BUDGET ? 'combined' : 'logit';
}

export interface OutOfFoldScores {
  /** Triple indexes in the graph that were scored, and their predicate term ids. */
  triples: Int32Array;
  predicate: Int32Array;
  /** The decoder's logit per scored triple. */
  logit: Float32Array;
  /** Filtered ranks (1 = best) among candidate subjects / objects; absent when ranks were not computed. */
  subjectRank?: Float64Array;
  objectRank?: Float64Array;
  /** The number of candidate entities a rank is out of. */
  candidates: number;
}

/** Measured on corrupted UMLS and Kinship: m = 30 matched or beat 0, 3 and 10 (and was within noise of 100). */
export const DEFAULT_PRIOR = 30;

export interface PlausibilityOptions {
  basis?: PlausibilityBasis;
  /** Pseudo-count m pulling small predicates towards the whole graph. */
  prior?: number;
}

/** Mid-rank share below: for each value, (#lower + ½ #equal-others) / (n − 1); 0.5 when n = 1. */
function shareBelow(values: Float64Array): Float64Array {
  const n = values.length;
  const out = new Float64Array(n);
  if (n === 1) {
    out[0] = 0.5;
    return out;
  }
  const order = Array.from({ length: n }, (_, i) => i).sort((a, b) => values[a]! - values[b]!);
  let i = 0;
  while (i < n) {
    let j = i;
    while (j + 1 < n && values[order[j + 1]!] === values[order[i]!]) j++;
    // Items i..j tie: each has i lower and (j − i) equal others.
    const share = (i + 0.5 * (j - i)) / (n - 1);
    for (let k = i; k <= j; k++) out[order[k]!] = share;
    i = j + 1;
  }
  return out;
}

/** The calibrated share per item: within its group, shrunk towards the whole set by `prior`. */
export function calibrateByGroup(values: Float64Array, group: Int32Array, prior = DEFAULT_PRIOR): Float64Array {
  const n = values.length;
  const global = shareBelow(values);
  const members = new Map<number, number[]>();
  for (let i = 0; i < n; i++) {
    const g = group[i]!;
    let list = members.get(g);
    if (!list) members.set(g, (list = []));
    list.push(i);
  }
  const out = new Float64Array(n);
  for (const list of members.values()) {
    const local = shareBelow(Float64Array.from(list, (i) => values[i]!));
    const others = list.length - 1;
    list.forEach((i, k) => {
      out[i] = (local[k]! * others + prior * global[i]!) / (others + prior);
    });
  }
  return out;
}

/** The mean filtered-rank percentile per triple: 1 for rank 1 on both sides, 0 for last on both. */
export function rankPercentile(scores: OutOfFoldScores): Float64Array {
  const { subjectRank, objectRank, candidates } = scores;
  if (!subjectRank || !objectRank) throw new Error('rank-based plausibility needs filtered subject and object ranks');
  const span = Math.max(1, candidates - 1);
  return Float64Array.from(subjectRank, (rs, i) => 1 - ((rs - 1) / span + (objectRank[i]! - 1) / span) / 2);
}

/** Plausibility in [0, 1] per scored triple (same order as `scores.triples`); low is suspect. */
export function plausibility(scores: OutOfFoldScores, options: PlausibilityOptions = {}): Float64Array {
  const basis = options.basis ?? 'logit';
  const prior = options.prior ?? DEFAULT_PRIOR;
  const byLogit = (): Float64Array => calibrateByGroup(Float64Array.from(scores.logit), scores.predicate, prior);
  const byRank = (): Float64Array => calibrateByGroup(rankPercentile(scores), scores.predicate, prior);
  if (basis === 'logit') return byLogit();
  if (basis === 'rank') return byRank();
  // The mean of two shares is not itself a share (its tails are thin), so it is calibrated once more.
  const a = byLogit();
  const b = byRank();
  return calibrateByGroup(a.map((x, i) => (x + b[i]!) / 2), scores.predicate, prior);
}

/** Counts by plausibility in `bins` equal-width bins over [0, 1], lowest first (1 falls in the last). */
export function histogram(values: ArrayLike<number>, bins = 20): number[] {
  const out = new Array<number>(bins).fill(0);
  for (let i = 0; i < values.length; i++) {
    const v = values[i]!;
    if (Number.isNaN(v)) continue;
    out[Math.min(bins - 1, Math.max(0, Math.floor(v * bins)))]!++;
  }
  return out;
}
