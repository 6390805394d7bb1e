import type { Finding } from '../findings.js';
import { row } from '../graph/store.js';
import { minedSeverity, mineTypeProfiles, typeScore, type Position, type TypeRule } from '../schema/mined.js';
import { shortName } from '../schema/vocab.js';
import type { Check, ReportInput } from './types.js';
import { dataPredicates } from './util.js';

/**
 * A triple whose subject or object lacks a type that nearly all of its predicate's subjects or
 * objects have (mined type rules, `src/schema/mined.ts`). A predicate with a declared domain (for
 * subjects) or range (for objects) is left to the `domain` and `range` checks.
 */
export const minedType: Check = {
  meta: {
    id: 'mined-type',
    title: 'Type rare for its predicate',
    severity: 'note',
    description:
      'The subject (object) of a triple lacks a class, or a datatype, that at least --min-confidence of the typed ' +
      'subjects (objects) of its predicate have, over at least --min-support of them (after Paulheim & Bizer 2014). ' +
      'A warning when the rule holds on 99% of 100 or more.',
    messages: {
      subject: '{entity} is the subject of {predicate}, but is not a {expected}, unlike {count} of the {support} typed subjects of {predicate}',
      object: '{entity} is the object of {predicate}, but is not a {expected}, unlike {count} of the {support} typed objects of {predicate}',
    },
  },
  run(ctx) {
    const { graph, schema, options } = ctx;
    const keys = graph.terms.allKeys();
    const declared = (p: number, position: Position): boolean => (position === 'subject' ? schema.domainsOf(p) : schema.rangesOf(p)).length > 0;
    const mined = mineTypeProfiles(graph, schema, options.mined, declared);
    const findings: Finding[] = [];
    for (const p of dataPredicates(graph)) {
      for (const position of ['subject', 'object'] as const) {
        const profile = mined.profile(p, position);
        if (!profile || profile.rules.length === 0) continue;
        const column = position === 'subject' ? graph.s : graph.o;
        const verdicts = new Map<number, Omit<ReportInput, 'triple'> | null>();
        for (const t of row(graph.byPredicate, p)) {
          const entity = column[t]!;
          const sig = mined.signature(entity, position);
          if (sig === 0) continue;
          let verdict = verdicts.get(sig);
          if (verdict === undefined) {
            const classes = mined.classesOf(sig);
            const broken: TypeRule[] = classes.length === 0 ? [] : profile.rules.filter((r) => !classes.includes(r.cls));
            if (broken.length === 0) verdict = null;
            else {
              // The rule with the lowest confidence is the most specific one broken.
              const rule = broken[0]!;
              const own = classes.map((c) => ({ class: profile.className(c), count: profile.counts.get(c) ?? 0 }));
              verdict = {
                messageId: position,
                severity: minedSeverity(rule.confidence, rule.support),
                data: { predicate: shortName(keys[p]!), expected: shortName(profile.className(rule.cls)), count: rule.count, support: rule.support },
                evidence: {
                  position,
                  expected: profile.className(rule.cls),
                  support: rule.support,
                  count: rule.count,
                  confidence: round(rule.confidence),
                  brokenRules: broken.map((r) => ({ class: profile.className(r.cls), count: r.count, confidence: round(r.confidence) })),
                  types: own,
                  score: round(typeScore(profile, classes)),
                },
              };
            }
            verdicts.set(sig, verdict);
          }
          if (verdict) findings.push(ctx.finding({ ...verdict, triple: t, data: { ...verdict.data, entity: shortName(keys[entity]!) } }));
        }
      }
    }
    return findings;
  },
};

function round(x: number): number {
  return Math.round(x * 10_000) / 10_000;
}
