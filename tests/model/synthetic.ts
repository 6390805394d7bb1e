import { GraphBuilder, type Graph } from '../../src/graph/store.js';
import { Random } from '../../src/model/random.js';

/**
 * A small graph with structure a model can learn: entities fall into `groups` (a power of two);
 * predicate r links an entity of group g to entities of group g XOR (r + 1), so the object's group
 * is fixed by the subject's group and the predicate — a symmetric pattern, which DistMult (symmetric
 * in s and o) can express. Held-out triples are predictable; a random ranking gets an MRR near
 * H(entities)/entities.
 */
export function groupedGraph(options: { entities?: number; groups?: number; predicates?: number; triples?: number; seed?: number } = {}): Graph {
  const entities = options.entities ?? 64;
  const groups = options.groups ?? 8;
  const predicates = options.predicates ?? 3;
  const triples = options.triples ?? 600;
  const random = new Random(options.seed ?? 3);
  const b = new GraphBuilder();
  const f = b.addFile('synthetic.nt');
  // Intern entities first, in index order.
  for (let e = 0; e < entities; e++) b.terms.intern(`http://example.org/e${e}`);
  let line = 0;
  while (b.size < triples) {
    const s = random.int(entities);
    const r = random.int(predicates);
    const target = (s % groups) ^ ((r + 1) % groups);
    const o = target + groups * random.int(Math.floor(entities / groups));
    b.addKeys(`http://example.org/e${s}`, `http://example.org/p${r}`, `http://example.org/e${o}`, undefined, f, ++line);
  }
  return b.build();
}
