import type { Finding } from '../findings.js';
import { row } from '../graph/store.js';
import { literalValueKey } from '../schema/xsd.js';
import { shortName } from '../schema/vocab.js';
import type { CheckContext } from './types.js';
import { at, isLiteralKey } from './util.js';

const SAMPLE = 10;

/**
 * Shared by `functional` and `inverse-functional`: for each property P declared with the
 * characteristic, the values of P and of all its sub-properties (which are values of P by rdfs7)
 * are grouped by subject (functional) or by object (inverse-functional), and a group with two
 * different values gives one finding. Two literals with the same value ("1"^^xsd:integer,
 * "01"^^xsd:integer) are one value (OWL 2 Direct Semantics compares data values). Two different
 * resources are not a contradiction in OWL, which would infer owl:sameAs: a warning under the
 * open world, an error with closedWorld (the unique name assumption); a literal against anything
 * else different is an error.
 */
export function checkAtMostOne(ctx: CheckContext, characteristic: 'functional' | 'inverseFunctional'): Finding[] {
  const { graph, schema, options } = ctx;
  const keys = graph.terms.allKeys();
  const [groupBy, valueOf] = characteristic === 'functional' ? [graph.s, graph.o] : [graph.o, graph.s];
  const findings: Finding[] = [];
  // The first triple seen per entity; a Map only for entities with a second, different value.
  const first = new Int32Array(graph.terms.size).fill(-1);
  for (const [property, declared] of schema.withCharacteristic(characteristic)) {
    const groups = new Map<number, number[]>();
    const touched: number[] = [];
    for (const q of schema.subProperties(property)) {
      if (q >= graph.terms.size) continue;
      for (const t of row(graph.byPredicate, q)) {
        const e = groupBy[t]!;
        const f = first[e]!;
        if (f < 0) {
          first[e] = t;
          touched.push(e);
          continue;
        }
        const list = groups.get(e);
        if (list) list.push(t);
        else if (valueOf[f] !== valueOf[t]) groups.set(e, [f, t]);
      }
    }
    for (const e of touched) first[e] = -1;
    for (const [entity, triples] of groups) {
      if (triples.length < 2) continue;
      triples.sort((a, b) => a - b);
      const distinct = distinctValues(triples.map((t) => keys[valueOf[t]!]!));
      if (distinct.values.length < 2) continue;
      const firstDifferent = triples[distinct.firstNew[1]!]!;
      const literal = distinct.values.some(isLiteralKey);
      const severity = literal || options.closedWorld ? 'error' : 'warning';
      const declaredAt = at(declared);
      findings.push(
        ctx.finding({
          messageId: literal ? 'literals' : 'resources',
          severity,
          triple: firstDifferent,
          ...(characteristic === 'functional' ? { subject: keys[entity]!, object: '' } : { subject: '', object: keys[entity]! }),
          predicate: schema.key(property),
          data: { entity: shortName(keys[entity]!), predicate: shortName(schema.key(property)), count: distinct.values.length },
          evidence: {
            values: distinct.values.length,
            sample: distinct.values.slice(0, SAMPLE),
            triples: triples.length,
            property: schema.key(property),
            ...(declaredAt ? { declaredAt } : {}),
            openWorld: !options.closedWorld,
          },
        }),
      );
    }
  }
  return findings;
}

/** Distinct values by RDF term, merging literals with equal values; with the index where each new value first appears. */
function distinctValues(values: readonly string[]): { values: string[]; firstNew: number[] } {
  const out: string[] = [];
  const firstNew: number[] = [];
  const seen = new Set<string>();
  values.forEach((v, i) => {
    const value = isLiteralKey(v) ? literalValueKey(v) : v;
    if (seen.has(value)) return;
    seen.add(value);
    out.push(v);
    firstNew.push(i);
  });
  return { values: out, firstNew };
}
