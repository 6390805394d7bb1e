import { countingOrder } from './edges.js';

/**
 * The true triples to filter out of the candidates when ranking (the "filtered" setting of Bordes et
 * al. 2013), indexed both ways: the objects known for (s, r) and the subjects known for (r, o).
 */
export class KnownTriples {
  private readonly bySubject: Grouped;
  private readonly byObject: Grouped;

  constructor(s: Int32Array, r: Int32Array, o: Int32Array, entityCount: number, relationCount: number) {
    this.bySubject = new Grouped(r, s, o, entityCount, relationCount);
    this.byObject = new Grouped(r, o, s, entityCount, relationCount);
  }

  /** The known objects of (s, r, ?) (a view; do not modify). */
  objects(s: number, r: number): Int32Array {
    return this.bySubject.get(r, s);
  }

  /** The known subjects of (?, r, o) (a view; do not modify). */
  subjects(r: number, o: number): Int32Array {
    return this.byObject.get(r, o);
  }

  has(s: number, r: number, o: number): boolean {
    const objects = this.objects(s, r);
    for (let i = 0; i < objects.length; i++) if (objects[i] === o) return true;
    return false;
  }
}

/** Values grouped by (relation, key): sorted by relation, then key; binary search within a relation. */
class Grouped {
  private readonly relationOffsets: Int32Array;
  private readonly keys: Int32Array;
  private readonly values: Int32Array;

  constructor(r: Int32Array, key: Int32Array, value: Int32Array, entityCount: number, relationCount: number) {
    const n = r.length;
    // Least-significant first: by value, then key, then relation; duplicates end up adjacent.
    const byValue = countingOrder(n, entityCount, (i) => value[i]!, null);
    const byKey = countingOrder(n, entityCount, (i) => key[i]!, byValue);
    const order = countingOrder(n, relationCount, (i) => r[i]!, byKey);
    const keys = new Int32Array(n);
    const values = new Int32Array(n);
    this.relationOffsets = new Int32Array(relationCount + 1);
    let m = 0;
    for (let k = 0; k < n; k++) {
      const i = order[k]!;
      if (m > 0 && keys[m - 1] === key[i] && values[m - 1] === value[i] && k > 0 && r[order[k - 1]!] === r[i]) continue;
      keys[m] = key[i]!;
      values[m] = value[i]!;
      this.relationOffsets[r[i]! + 1]!++;
      m++;
    }
    this.keys = keys.slice(0, m);
    this.values = values.slice(0, m);
    for (let q = 0; q < relationCount; q++) this.relationOffsets[q + 1]! += this.relationOffsets[q]!;
  }

  get(r: number, key: number): Int32Array {
    if (r < 0 || r + 1 >= this.relationOffsets.length) return this.values.subarray(0, 0);
    const lo = lowerBound(this.keys, this.relationOffsets[r]!, this.relationOffsets[r + 1]!, key);
    const hi = lowerBound(this.keys, lo, this.relationOffsets[r + 1]!, key + 1);
    return this.values.subarray(lo, hi);
  }
}

function lowerBound(a: Int32Array, lo: number, hi: number, x: number): number {
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (a[mid]! < x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * The filtered rank of candidate `target` in one row of scores: 1 + (candidates scoring higher) +
 * (candidates tying with it) / 2, where other known true candidates (`filter`) are not counted.
 * The tie rule is the mean of the optimistic (ties below) and pessimistic (ties above) ranks, so a
 * model that scores everything equal gets the expected rank of a random order, not rank 1.
 */
export function filteredRank(row: Float32Array, target: number, filter: Int32Array): number {
  const score = row[target]!;
  if (Number.isNaN(score)) return (row.length + 1) / 2;
  let greater = 0;
  let equal = 0;
  for (let e = 0; e < row.length; e++) {
    const v = row[e]!;
    if (v > score) greater++;
    else if (v === score) equal++;
  }
  equal--; // the target itself
  for (let i = 0; i < filter.length; i++) {
    const f = filter[i]!;
    if (f === target) continue;
    const v = row[f]!;
    if (v > score) greater--;
    else if (v === score) equal--;
  }
  return 1 + greater + equal / 2;
}
