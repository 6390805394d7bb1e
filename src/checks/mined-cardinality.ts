import type { Finding } from '../findings.js';
import { mineCardinality, minedSeverity, type Direction } from '../schema/mined.js';
import { shortName } from '../schema/vocab.js';
import type { Check } from './types.js';

const SAMPLE = 10;

/**
 * A subject with several values of a predicate that has one value on nearly every subject (or an
 * object shared by several subjects where nearly every object has one), mined from the data
 * (`src/schema/mined.ts`). Predicates declared functional / inverse-functional are left to those checks.
 */
export const minedCardinality: Check = {
  meta: {
    id: 'mined-cardinality',
    title: 'More values than the predicate usually has',
    severity: 'note',
    description:
      'An entity has two or more values of a predicate where at least --min-confidence of its (at least ' +
      '--min-support) subjects have exactly one; or the same for objects shared by several subjects. A warning ' +
      'when the rule holds on 99% of 100 or more. Numbers, dates and booleans are left out of the shared-value ' +
      'direction: many subjects share them by nature.',
    messages: {
      out: '{entity} has {count} values of {predicate}, but {single} of the {support} subjects of {predicate} have one',
      in: '{entity} is the value of {predicate} for {count} subjects, but {single} of the {support} values of {predicate} belong to one',
    },
  },
  run(ctx) {
    const { graph, schema, options } = ctx;
    const keys = graph.terms.allKeys();
    const declared = (p: number, direction: Direction): boolean =>
      schema.superProperties(p).some((q) => schema.hasCharacteristic(q, direction === 'out' ? 'functional' : 'inverseFunctional'));
    const findings: Finding[] = [];
    for (const rule of mineCardinality(graph, schema, options.mined, declared)) {
      const other = rule.direction === 'out' ? graph.o : graph.s;
      for (const [entity, triples] of rule.breaches) {
        findings.push(
          ctx.finding({
            messageId: rule.direction,
            severity: minedSeverity(rule.confidence, rule.support),
            triple: triples[1]!,
            ...(rule.direction === 'out' ? { subject: keys[entity]!, object: '' } : { subject: '', object: keys[entity]! }),
            data: {
              entity: shortName(keys[entity]!),
              predicate: shortName(keys[rule.predicate]!),
              count: triples.length,
              single: rule.single,
              support: rule.support,
            },
            evidence: {
              direction: rule.direction,
              values: triples.length,
              sample: triples.slice(0, SAMPLE).map((t) => keys[other[t]!]!),
              support: rule.support,
              single: rule.single,
              confidence: Math.round(rule.confidence * 10_000) / 10_000,
            },
          }),
        );
      }
    }
    return findings;
  },
};
