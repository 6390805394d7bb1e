import type { Axiom } from './axioms.js';

/**
 * The strongly connected components with two or more members of the graph whose edges are `edges`
 * (Tarjan 1972, iterative so that a hierarchy thousands of levels deep cannot overflow the stack).
 * Each component comes with one of its edges, to name where the cycle is declared.
 */
export function findCycles(edges: readonly Axiom[], ignore: ReadonlySet<string>): Array<{ members: number[]; edge: Axiom }> {
  const next = new Map<number, Axiom[]>();
  for (const e of edges) {
    if (e.a === e.b || ignore.has(`${e.a} ${e.b}`)) continue;
    let list = next.get(e.a);
    if (!list) next.set(e.a, (list = []));
    list.push(e);
  }
  const index = new Map<number, number>();
  const low = new Map<number, number>();
  const onStack = new Set<number>();
  const stack: number[] = [];
  const out: Array<{ members: number[]; edge: Axiom }> = [];
  let counter = 0;

  for (const start of next.keys()) {
    if (index.has(start)) continue;
    // Each frame: the node and how many of its edges have been followed.
    const frames: Array<[number, number]> = [[start, 0]];
    index.set(start, counter);
    low.set(start, counter++);
    stack.push(start);
    onStack.add(start);
    while (frames.length > 0) {
      const frame = frames[frames.length - 1]!;
      const [v, i] = frame;
      const succ = next.get(v) ?? [];
      if (i < succ.length) {
        frame[1]++;
        const w = succ[i]!.b;
        if (!index.has(w)) {
          index.set(w, counter);
          low.set(w, counter++);
          stack.push(w);
          onStack.add(w);
          frames.push([w, 0]);
        } else if (onStack.has(w)) {
          low.set(v, Math.min(low.get(v)!, index.get(w)!));
        }
        continue;
      }
      frames.pop();
      const parent = frames[frames.length - 1];
      if (parent) low.set(parent[0], Math.min(low.get(parent[0])!, low.get(v)!));
      if (low.get(v) === index.get(v)) {
        const members: number[] = [];
        let w: number;
        do {
          w = stack.pop()!;
          onStack.delete(w);
          members.push(w);
        } while (w !== v);
        if (members.length > 1) {
          const inside = new Set(members);
          const edge = members.flatMap((m) => next.get(m) ?? []).find((e) => inside.has(e.b))!;
          out.push({ members: members.sort((x, y) => x - y), edge });
        }
      }
    }
  }
  return out;
}
