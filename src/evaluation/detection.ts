/**
 * Detection metrics: how well a ranking of existing triples puts the wrong ones first.
 *
 * Every function takes `suspicion` (higher = ranked earlier, i.e. more suspect) and `labels`
 * (1 = a known error, 0 = a triple taken as true), one entry per ranked triple.
 *
 * Ties are common (a degree heuristic gives many triples the same figure; ranks are integers), and a
 * metric must not reward or punish the arbitrary order a sort leaves tied items in. Every figure here
 * is therefore the *expected* value over a uniformly random order within each group of tied scores:
 * - ROC-AUC gives a tied (error, true) pair half credit — the trapezoid rule of Fawcett 2006
 *   ("An introduction to ROC analysis", Pattern Recognition Letters 27, Algorithm 2), which equals
 *   the expected area over random tie-breaking;
 * - average precision uses the tie-aware form of McSherry & Najork 2008 ("Computing information
 *   retrieval performance measures efficiently in the presence of tied scores", ECIR): for a tied
 *   group of t items holding r errors, after n items holding R errors,
 *     Σ_{j=1..t} (r/t) · (R + 1 + (j−1)(r−1)/(t−1)) / (n + j)
 *   is the expected sum of the precisions at the group's errors (the (j−1)(r−1)/(t−1) term is the
 *   hypergeometric mean of errors among the j−1 items ahead of an error at slot j; 0 when t = 1).
 *   Without ties this is the average of the precisions at each error's position, the definition of
 *   Manning, Raghavan & Schütze 2008, "Introduction to Information Retrieval", §8.4;
 * - precision@K and recall in the top share count a group that straddles the cut pro rata.
 */

export interface DetectionMetrics {
  /** Average precision; the share of errors is what a random order scores. */
  ap: number;
  /** Area under the ROC curve; 0.5 is a random order. */
  rocAuc: number;
  /** Precision among the first K ranked, K = the number of errors. */
  precisionAtK: number;
  /** The share of all errors found in the first 1% of the ranking (at least one triple). */
  recallAt1pct: number;
  /** Errors and ranked triples counted. */
  errors: number;
  total: number;
}

interface Group {
  /** Items ahead of this group and errors among them. */
  before: number;
  errorsBefore: number;
  size: number;
  errors: number;
}

/** Orders the items by falling suspicion and folds equal scores into groups. NaN ranks last. */
function groups(suspicion: ArrayLike<number>, labels: ArrayLike<number>): { groups: Group[]; errors: number; total: number } {
  const n = suspicion.length;
  if (labels.length !== n) throw new RangeError(`suspicion has ${n} entries but labels has ${labels.length}`);
  const key = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const v = suspicion[i]!;
    key[i] = Number.isNaN(v) ? -Infinity : v;
  }
  const order = new Uint32Array(n);
  for (let i = 0; i < n; i++) order[i] = i;
  order.sort((a, b) => key[b]! - key[a]! || 0);
  const out: Group[] = [];
  let before = 0;
  let errorsBefore = 0;
  let i = 0;
  while (i < n) {
    const v = key[order[i]!]!;
    let errors = 0;
    let j = i;
    while (j < n && key[order[j]!] === v) {
      if (labels[order[j]!]! > 0) errors++;
      j++;
    }
    out.push({ before, errorsBefore, size: j - i, errors });
    before += j - i;
    errorsBefore += errors;
    i = j;
  }
  return { groups: out, errors: errorsBefore, total: n };
}

function apOf(gs: Group[], errors: number): number {
  if (errors === 0) return Number.NaN;
  let sum = 0;
  for (const g of gs) {
    if (g.errors === 0) continue;
    const { before: n, errorsBefore: R, size: t, errors: r } = g;
    const share = r / t;
    const mean = t === 1 ? 0 : (r - 1) / (t - 1);
    for (let j = 1; j <= t; j++) sum += (share * (R + 1 + (j - 1) * mean)) / (n + j);
  }
  return sum / errors;
}

function aucOf(gs: Group[], errors: number, total: number): number {
  const negatives = total - errors;
  if (errors === 0 || negatives === 0) return Number.NaN;
  let credit = 0;
  let negativesSeen = 0;
  for (const g of gs) {
    const groupNegatives = g.size - g.errors;
    negativesSeen += groupNegatives;
    credit += g.errors * (negatives - negativesSeen) + 0.5 * g.errors * groupNegatives;
  }
  return credit / (errors * negatives);
}

/** Expected errors among the first k ranked items. */
function errorsInTop(gs: Group[], k: number): number {
  let found = 0;
  for (const g of gs) {
    if (g.before >= k) break;
    const taken = Math.min(g.size, k - g.before);
    found += (taken * g.errors) / g.size;
  }
  return found;
}

export function averagePrecision(suspicion: ArrayLike<number>, labels: ArrayLike<number>): number {
  const { groups: gs, errors } = groups(suspicion, labels);
  return apOf(gs, errors);
}

export function rocAuc(suspicion: ArrayLike<number>, labels: ArrayLike<number>): number {
  const { groups: gs, errors, total } = groups(suspicion, labels);
  return aucOf(gs, errors, total);
}

/** Expected precision among the first k ranked items. */
export function precisionAt(suspicion: ArrayLike<number>, labels: ArrayLike<number>, k: number): number {
  const { groups: gs, total } = groups(suspicion, labels);
  const cut = Math.min(k, total);
  return cut <= 0 ? Number.NaN : errorsInTop(gs, cut) / cut;
}

/** Expected share of the errors found among the first ⌈share · n⌉ ranked items (at least one). */
export function recallAtShare(suspicion: ArrayLike<number>, labels: ArrayLike<number>, share: number): number {
  const { groups: gs, errors, total } = groups(suspicion, labels);
  if (errors === 0) return Number.NaN;
  return errorsInTop(gs, Math.max(1, Math.ceil(share * total))) / errors;
}

/** All four figures from one sort. */
export function detectionMetrics(suspicion: ArrayLike<number>, labels: ArrayLike<number>): DetectionMetrics {
  const { groups: gs, errors, total } = groups(suspicion, labels);
  return {
    ap: apOf(gs, errors),
    rocAuc: aucOf(gs, errors, total),
    precisionAtK: errors === 0 ? Number.NaN : errorsInTop(gs, errors) / errors,
    recallAt1pct: errors === 0 ? Number.NaN : errorsInTop(gs, Math.max(1, Math.ceil(0.01 * total))) / errors,
    errors,
    total,
  };
}

export interface DetectionTable {
  overall: DetectionMetrics;
  /** Each error kind ranked against the true triples alone (the other kinds' errors left out). */
  byKind: Record<string, DetectionMetrics>;
}

/**
 * Overall and per-kind figures. `kindOf[i]` is the error kind of item i, or null/undefined for a true
 * triple; per kind, the items of other kinds are left out so each kind is measured against the same
 * true triples.
 */
export function detectionTable(suspicion: ArrayLike<number>, kindOf: ReadonlyArray<string | null | undefined>): DetectionTable {
  const n = suspicion.length;
  const labels = new Uint8Array(n);
  const kinds = new Set<string>();
  for (let i = 0; i < n; i++) {
    const k = kindOf[i];
    if (k !== null && k !== undefined) {
      labels[i] = 1;
      kinds.add(k);
    }
  }
  const byKind: Record<string, DetectionMetrics> = {};
  for (const kind of [...kinds].sort()) {
    const keep: number[] = [];
    for (let i = 0; i < n; i++) {
      const k = kindOf[i];
      if (k === null || k === undefined || k === kind) keep.push(i);
    }
    const s = new Float64Array(keep.length);
    const l = new Uint8Array(keep.length);
    keep.forEach((i, j) => {
      s[j] = suspicion[i]!;
      l[j] = labels[i]!;
    });
    byKind[kind] = detectionMetrics(s, l);
  }
  return { overall: detectionMetrics(suspicion, labels), byKind };
}
