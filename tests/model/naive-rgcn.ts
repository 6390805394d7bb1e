/**
 * R-GCN written out from the paper with plain arrays, for equivalence tests: Schlichtkrull et al.
 * 2018, eq. 2 (layer), eq. 3 (basis), eq. 4 (block-diagonal). No tfjs, no sorting, no segments:
 * a loop over relation types, then over entities, then over neighbours.
 */
export type Matrix = number[][];

export interface NaiveEdge {
  src: number;
  dst: number;
  type: number;
}

/** Every triple (s, r, o) gives s → o of type r and o → s of type r + R. */
export function naiveEdges(s: ArrayLike<number>, r: ArrayLike<number>, o: ArrayLike<number>, relationCount: number): NaiveEdge[] {
  const edges: NaiveEdge[] = [];
  for (let t = 0; t < s.length; t++) {
    edges.push({ src: s[t]!, dst: o[t]!, type: r[t]! });
    edges.push({ src: o[t]!, dst: s[t]!, type: r[t]! + relationCount });
  }
  return edges;
}

export function zeros(rows: number, cols: number): Matrix {
  return Array.from({ length: rows }, () => new Array<number>(cols).fill(0));
}

/** Row vector times matrix. */
function vecMat(v: number[], m: Matrix): number[] {
  const out = new Array<number>(m[0]!.length).fill(0);
  for (let k = 0; k < v.length; k++) for (let c = 0; c < out.length; c++) out[c]! += v[k]! * m[k]![c]!;
  return out;
}

/** W_r = Σ_b a_{rb} V_b (eq. 3). */
export function basisWeight(a: Matrix, v: Matrix[], r: number): Matrix {
  const dIn = v[0]!.length;
  const dOut = v[0]![0]!.length;
  const w = zeros(dIn, dOut);
  for (let b = 0; b < v.length; b++) for (let i = 0; i < dIn; i++) for (let j = 0; j < dOut; j++) w[i]![j]! += a[r]![b]! * v[b]![i]![j]!;
  return w;
}

/** W_r = diag(Q_{1r}, …, Q_{Br}) (eq. 4); q[r][b] is a (d_in/B)×(d_out/B) block. */
export function blockWeight(q: Matrix[][], r: number): Matrix {
  const blocks = q[r]!;
  const ki = blocks[0]!.length;
  const ko = blocks[0]![0]!.length;
  const w = zeros(ki * blocks.length, ko * blocks.length);
  blocks.forEach((block, b) => {
    for (let i = 0; i < ki; i++) for (let j = 0; j < ko; j++) w[b * ki + i]![b * ko + j] = block[i]![j]!;
  });
  return w;
}

/**
 * h_i^{l+1} = W_0 h_i + Σ_r Σ_{j ∈ N_i^r} (1 / c_{i,r}) W_r h_j, c_{i,r} = |N_i^r| (eq. 2, before σ).
 */
export function naiveLayer(h: Matrix, edges: NaiveEdge[], w0: Matrix, weightOf: (r: number) => Matrix, types: number): Matrix {
  const n = h.length;
  const dOut = w0[0]!.length;
  const out = h.map((row) => vecMat(row, w0));
  for (let r = 0; r < types; r++) {
    const wr = weightOf(r);
    for (let i = 0; i < n; i++) {
      const neighbours = edges.filter((e) => e.type === r && e.dst === i).map((e) => e.src);
      if (neighbours.length === 0) continue;
      const c = neighbours.length;
      for (const j of neighbours) {
        const message = vecMat(h[j]!, wr);
        for (let k = 0; k < dOut; k++) out[i]![k]! += message[k]! / c;
      }
    }
  }
  return out;
}

/** A number, or arrays of them nested to any depth; callers cast to the shape they asked for. */
export type Nested = number | Nested[];

/** Reads a flat row-major array into nested arrays of the given shape (2-D, 3-D or 4-D). */
export function nest(values: ArrayLike<number>, shape: number[]): Nested {
  const [head, ...rest] = shape;
  const size = rest.reduce((a, b) => a * b, 1);
  return Array.from({ length: head! }, (_, i) => (rest.length === 0 ? values[i]! : nest(Array.prototype.slice.call(values, i * size, (i + 1) * size), rest)));
}
