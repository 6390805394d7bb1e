import type { Finding } from '../findings.js';
import { row } from '../graph/store.js';
import { shortName } from '../schema/vocab.js';
import type { Check } from './types.js';
import { at } from './util.js';

/** owl:IrreflexiveProperty (OWL 2 Structural Specification §9.2.9): no entity relates to itself, through the property or a sub-property. */
export const irreflexive: Check = {
  meta: {
    id: 'irreflexive',
    title: 'Irreflexive property relating an entity to itself',
    severity: 'error',
    description: 'A triple has the same subject and object, and its predicate is (a sub-property of) an owl:IrreflexiveProperty.',
    messages: {
      reflexive: '{entity} is related to itself by {predicate}, which is declared irreflexive',
    },
  },
  run(ctx) {
    const { graph, schema } = ctx;
    const findings: Finding[] = [];
    for (const [property, declared] of schema.withCharacteristic('irreflexive')) {
      for (const q of schema.subProperties(property)) {
        for (const t of row(graph.byPredicate, q)) {
          if (graph.s[t] !== graph.o[t]) continue;
          const declaredAt = at(declared);
          findings.push(
            ctx.finding({
              messageId: 'reflexive',
              triple: t,
              data: { entity: shortName(graph.terms.key(graph.s[t]!)), predicate: shortName(schema.key(property)) },
              evidence: { property: schema.key(property), ...(declaredAt ? { declaredAt } : {}) },
            }),
          );
        }
      }
    }
    return findings;
  },
};
