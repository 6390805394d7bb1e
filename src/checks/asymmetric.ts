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
    const inSet = new Uint8Array(graph.terms.size);
    for (const [property, declared] of schema.withCharacteristic('asymmetric')) {
      const subs = schema.subProperties(property).filter((q) => q < graph.terms.size);
      for (const q of subs) inSet[q] = 1;
      const declaredAt = at(declared);
      const evidence = { property: schema.key(property), ...(declaredAt ? { declaredAt } : {}) };
      for (const q of subs) {
        for (const t of row(graph.byPredicate, q)) {
          const s = graph.s[t]!;
          const o = graph.o[t]!;
          const data = { a: shortName(keys[s]!), b: shortName(keys[o]!), predicate: shortName(schema.key(property)) };
          if (s === o) {
            findings.push(ctx.finding({ messageId: 'reflexive', triple: t, data, evidence }));
            continue;
          }
          // The reverse link among the object's own triples; each pair is reported once, on its earlier triple.
          let reverse = -1;
          for (const u of row(graph.bySubject, o)) {
            if (inSet[graph.p[u]!] === 1 && graph.o[u] === s) {
              reverse = u;
              break;
            }
          }
          if (reverse > t) {
            findings.push(ctx.finding({ messageId: 'both', triple: t, data, evidence: compact({ ...evidence, reverseTriple: reverse, reverseSource: at(tripleSource(graph, reverse)) }) }));
          }
        }
      }
      for (const q of subs) inSet[q] = 0;
    }
    return findings;
  },
};
