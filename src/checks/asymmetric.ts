import type { Finding } from '../findings.js';
import { row } from '../graph/store.js';
import { shortName } from '../schema/vocab.js';
import type { Check } from './types.js';
import { tripleSource } from './context.js';
import { at, compact } from './util.js';

/**
 * owl:AsymmetricProperty (OWL 2 Structural Specification §9.2.8): if a relates to b, b must not
 * relate to a, through the property or any of its sub-properties; a relating to itself breaks it too.
 */
export const asymmetric: Check = {
  meta: {
    id: 'asymmetric',
    title: 'Asymmetric property stated both ways',
    severity: 'error',
    description: 'Two triples relate a to b and b to a by (sub-properties of) an owl:AsymmetricProperty, or one relates an entity to itself.',
    messages: {
      both: '{a} and {b} are related both ways by {predicate}, which is declared asymmetric',
      reflexive: '{a} is related to itself by {predicate}, which is declared asymmetric',
    },
  },
  run(ctx) {
    const { graph, schema } = ctx;
    const keys = graph.terms.allKeys();
    const findings: Finding[] = [];
    const n = graph.terms.size;
    for (const [property, declared] of schema.withCharacteristic('asymmetric')) {
      const pairs = new Map<number, number>();
      const triples: number[] = [];
      for (const q of schema.subProperties(property)) {
        for (const t of row(graph.byPredicate, q)) {
          triples.push(t);
          const key = graph.s[t]! * n + graph.o[t]!;
          if (!pairs.has(key)) pairs.set(key, t);
        }
      }
      triples.sort((a, b) => a - b);
      const declaredAt = at(declared);
      const evidence = { property: schema.key(property), ...(declaredAt ? { declaredAt } : {}) };
      for (const t of triples) {
        const s = graph.s[t]!;
        const o = graph.o[t]!;
        const data = { a: shortName(keys[s]!), b: shortName(keys[o]!), predicate: shortName(schema.key(property)) };
        if (s === o) {
          findings.push(ctx.finding({ messageId: 'reflexive', triple: t, data, evidence }));
          continue;
        }
        const reverse = pairs.get(o * n + s);
        // Report each pair once, on its earlier triple.
        if (reverse !== undefined && reverse > t && pairs.get(s * n + o) === t) {
          findings.push(ctx.finding({ messageId: 'both', triple: t, data, evidence: compact({ ...evidence, reverseTriple: reverse, reverseSource: at(tripleSource(graph, reverse)) }) }));
        }
      }
    }
    return findings;
  },
};
