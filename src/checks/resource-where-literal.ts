import type { Finding } from '../findings.js';
import { row } from '../graph/store.js';
import { shortName } from '../schema/vocab.js';
import type { Check } from './types.js';
import { dataPredicates, isLiteralKey, keysOf } from './util.js';

/** An IRI or blank node as the object of a property whose range is a datatype, or that is declared an owl:DatatypeProperty. */
export const resourceWhereLiteral: Check = {
  meta: {
    id: 'resource-where-literal',
    title: 'Resource where a literal is required',
    severity: 'error',
    description: 'The object is an IRI or a blank node, but the predicate has a datatype as rdfs:range or is declared owl:DatatypeProperty.',
    messages: {
      resource: 'the value {value} of {predicate} is a resource, but {predicate} expects a literal ({why})',
    },
  },
  run(ctx) {
    const { graph, schema } = ctx;
    const keys = graph.terms.allKeys();
    const findings: Finding[] = [];
    for (const p of dataPredicates(graph)) {
      if (schema.expectedObject(p) !== 'literal') continue;
      const ranges = keysOf(schema, schema.rangesOf(p).filter((r) => schema.isDatatype(r)));
      const why = ranges.length > 0 ? `range ${ranges.map(shortName).join(', ')}` : 'owl:DatatypeProperty';
      for (const t of row(graph.byPredicate, p)) {
        const object = keys[graph.o[t]!]!;
        if (isLiteralKey(object)) continue;
        findings.push(
          ctx.finding({
            messageId: 'resource',
            triple: t,
            data: { value: shortName(object), predicate: shortName(keys[p]!), why },
            evidence: { expected: 'literal', ranges },
          }),
        );
      }
    }
    return findings;
  },
};
