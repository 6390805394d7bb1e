/**
 * A small seeded generator (mulberry32, common practice) so that a run is repeatable: batches,
 * negatives, edge dropout, held-out splits and initial weights all draw from it.
 */
export class Random {
  private state: number;

  constructor(seed: number) {
    this.state = (seed ^ 0x9e3779b9) >>> 0;
    for (let i = 0; i < 4; i++) this.next();
  }

  /** Uniform in [0, 1). */
  next(): number {
    let t = (this.state = (this.state + 0x6d2b79f5) >>> 0);
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  }

  /** Uniform integer in [0, n). */
  int(n: number): number {
    return Math.floor(this.next() * n);
  }

  /** A 31-bit seed for a derived generator (tfjs ops that take a seed). */
  seed(): number {
    return this.int(2 ** 31 - 1);
  }

  /** Fisher–Yates, in place. */
  shuffle<T extends { length: number; [i: number]: number }>(array: T): T {
    for (let i = array.length - 1; i > 0; i--) {
      const j = this.int(i + 1);
      const t = array[i]!;
      array[i] = array[j]!;
      array[j] = t;
    }
    return array;
  }

  /** Values uniform in [-limit, limit). */
  uniform(n: number, limit: number): Float32Array {
    const out = new Float32Array(n);
    for (let i = 0; i < n; i++) out[i] = (this.next() * 2 - 1) * limit;
    return out;
  }
}
