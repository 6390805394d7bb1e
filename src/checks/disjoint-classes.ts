import type { Finding } from '../findings.js';
import { row } from '../graph/store.js';
import { shortName } from '../schema/vocab.js';
import type { Check } from './types.js';
import { at, keysOf } from './util.js';

/**
 * owl:disjointWith and owl:AllDisjointClasses (OWL 2 Structural Specification §9.1.3): no entity
 * may be an instance of two disjoint classes, after the subclass closure of its types.
 */
export const disjointClasses: Check = {
  meta: {
    id: 'disjoint-classes',
    title: 'Instance of two disjoint classes',
    severity: 'error',
    description: 'An entity is typed (directly or through rdfs:subClassOf) with two classes declared disjoint.',
    messages: {
      disjoint: '{entity} is both a {a} and a {b}, which are declared disjoint',
    },
  },
  run(ctx) {
    const { graph, schema } = ctx;
    const findings: Finding[] = [];
    if (schema.typePredicate < 0) return findings;
    const pairsBySet = new Map<number, Array<[number, number]>>();
    for (let index = 1; index < schema.typeSetCount; index++) {
      const pairs = schema.disjointPairs(schema.typeSet(index));
      if (pairs.length > 0) pairsBySet.set(index, pairs);
    }
    if (pairsBySet.size === 0) return findings;
    const keys = graph.terms.allKeys();
    for (let entity = 0; entity < graph.terms.size; entity++) {
      const setIndex = schema.typeSetIndex(entity);
      const pairs = pairsBySet.get(setIndex);
      if (!pairs) continue;
      const typeTriples = Array.from(row(graph.bySubject, entity)).filter((t) => graph.p[t] === schema.typePredicate);
      for (const [a, b] of pairs) {
        // Point at the later of the two rdf:type triples that bring the classes in: the one that made the clash.
        const first = (cls: number): number => typeTriples.find((t) => schema.superClasses(graph.o[t]!).includes(cls)) ?? typeTriples[0]!;
        const via = Math.max(first(a), first(b));
        const declaredAt = at(schema.axiomSource('disjointWith', a, b));
        findings.push(
          ctx.finding({
            messageId: 'disjoint',
            triple: via,
            data: { entity: shortName(keys[entity]!), a: shortName(schema.key(a)), b: shortName(schema.key(b)) },
            evidence: {
              classes: [schema.key(a), schema.key(b)],
              asserted: keysOf(schema, schema.assertedTypesOf(entity)),
              ...(declaredAt ? { declaredAt } : {}),
            },
          }),
        );
      }
    }
    return findings;
  },
};
