import type { Finding } from '../findings.js';
import { row } from '../graph/store.js';
import { shortName } from '../schema/vocab.js';
import type { Check } from './types.js';
import { dataPredicates, isLiteralKey, keysOf } from './util.js';

/** A literal as the object of a property whose range is a class, or that is declared an owl:ObjectProperty. */
export const literalWhereResource: Check = {
  meta: {
    id: 'literal-where-resource',
    title: 'Literal where a resource is required',
    severity: 'error',
    description: 'The object is a literal, but the predicate has a class as rdfs:range or is declared owl:ObjectProperty.',
    messages: {
      literal: 'the value {value} of {predicate} is a literal, but {predicate} expects a resource ({why})',
    },
  },
  run(ctx) {
    const { graph, schema } = ctx;
    const keys = graph.terms.allKeys();
    const findings: Finding[] = [];
    for (const p of dataPredicates(graph)) {
      if (schema.expectedObject(p) !== 'resource') continue;
      const ranges = keysOf(schema, schema.rangesOf(p).filter((r) => !schema.isDatatype(r)));
      const why = ranges.length > 0 ? `range ${ranges.map(shortName).join(', ')}` : 'owl:ObjectProperty';
      for (const t of row(graph.byPredicate, p)) {
        const object = keys[graph.o[t]!]!;
        if (!isLiteralKey(object)) continue;
        findings.push(
          ctx.finding({
            messageId: 'literal',
            triple: t,
            data: { value: object.length > 60 ? `${object.slice(0, 57)}…` : object, predicate: shortName(keys[p]!), why },
            evidence: { expected: 'resource', ranges },
          }),
        );
      }
    }
    return findings;
  },
};
