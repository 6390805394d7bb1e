import { row } from '../graph/store.js';
import type { Finding } from '../findings.js';
import { checkTypeRequirement } from './type-requirement.js';
import type { Check } from './types.js';
import { dataPredicates } from './util.js';

/** rdfs:domain (RDF 1.1 Semantics rule rdfs2), read as a requirement on the subject's types. */
export const domain: Check = {
  meta: {
    id: 'domain',
    title: 'Subject outside the domain of its predicate',
    severity: 'warning',
    description:
      'The subject of a triple lacks a class that the predicate (or a super-property) declares as rdfs:domain. ' +
      'Under the open-world reading of RDFS this only means the type is not stated (warning); a subject whose ' +
      'stated types are disjoint with the domain is an error. --closed-world makes a missing type an error.',
    messages: {
      missingType: '{entity} is the subject of {predicate}, whose domain is {expected}, but is typed only {types}',
      untyped: '{entity} is the subject of {predicate}, whose domain is {expected}, but has no rdf:type',
      disjoint: '{entity} is the subject of {predicate}, whose domain is {expected}, but is a {type}, declared disjoint with {other}',
    },
  },
  run(ctx) {
    const findings: Finding[] = [];
    for (const p of dataPredicates(ctx.graph)) {
      const required = ctx.schema.domainsOf(p);
      if (required.length === 0) continue;
      findings.push(...checkTypeRequirement(ctx, 'domain', p, row(ctx.graph.byPredicate, p), required));
    }
    return findings;
  },
};
