import { row } from '../graph/store.js';
import type { Finding } from '../findings.js';
import { datatypeConforms } from '../schema/xsd.js';
import { shortName } from '../schema/vocab.js';
import { checkTypeRequirement } from './type-requirement.js';
import type { Check } from './types.js';
import { at, dataPredicates, literalDatatypes } from './util.js';

/**
 * rdfs:range (rule rdfs3), read as a requirement on the object: its classes when the range is a
 * class, its datatype when the range is a datatype. A literal where a class is required, or a
 * resource where a datatype is, belongs to `literal-where-resource` / `resource-where-literal`.
 */
export const range: Check = {
  meta: {
    id: 'range',
    title: 'Object outside the range of its predicate',
    severity: 'warning',
    description:
      'The object of a triple lacks a class the predicate (or a super-property) declares as rdfs:range (warning under ' +
      'the open world, error when its stated types are disjoint with the range or with --closed-world), or is a ' +
      'literal whose datatype is not the declared datatype range (error).',
    messages: {
      missingType: '{entity} is the object of {predicate}, whose range is {expected}, but is typed only {types}',
      untyped: '{entity} is the object of {predicate}, whose range is {expected}, but has no rdf:type',
      disjoint: '{entity} is the object of {predicate}, whose range is {expected}, but is a {type}, declared disjoint with {other}',
      datatype: 'the value of {predicate} has datatype {actual}, but its range is {expected}',
    },
  },
  run(ctx) {
    const { graph, schema } = ctx;
    const keys = graph.terms.allKeys();
    const literals = literalDatatypes(graph);
    const findings: Finding[] = [];
    for (const p of dataPredicates(graph)) {
      const ranges = schema.rangesOf(p);
      if (ranges.length === 0) continue;
      const classes = ranges.filter((r) => !schema.isDatatype(r));
      const datatypes = ranges.filter((r) => schema.isDatatype(r));
      const resourceTriples: number[] = [];
      // The datatypes that fail, per literal datatype index (computed once each).
      const failedBy = new Map<number, number[]>();
      for (const t of row(graph.byPredicate, p)) {
        const dt = literals.of[graph.o[t]!]!;
        if (dt < 0) {
          if (classes.length > 0) resourceTriples.push(t);
          continue;
        }
        if (datatypes.length === 0) continue;
        const actual = literals.names[dt]!;
        let failed = failedBy.get(dt);
        if (!failed) failedBy.set(dt, (failed = datatypes.filter((d) => !datatypeConforms(actual, schema.key(d)))));
        if (failed.length === 0) continue;
        const expected = failed.map((d) => schema.key(d));
        const via = schema.declaringProperty('range', p, failed[0]!);
        const declaredAt = at(schema.axiomSource('range', via, failed[0]!));
        findings.push(
          ctx.finding({
            messageId: 'datatype',
            severity: 'error',
            triple: t,
            data: { predicate: shortName(keys[p]!), actual: shortName(actual), expected: expected.map(shortName).join(', ') },
            evidence: { actual, expected, property: schema.key(via), ...(declaredAt ? { declaredAt } : {}) },
          }),
        );
      }
      if (resourceTriples.length > 0) findings.push(...checkTypeRequirement(ctx, 'range', p, resourceTriples, classes));
    }
    return findings;
  },
};
