import type { Finding } from '../findings.js';
import { shortName } from '../schema/vocab.js';
import type { CheckContext, ReportInput } from './types.js';
import { at, compact, keysOf, names } from './util.js';

/**
 * The shared logic of `domain` and `range` for resources: does the entity at one end of a triple
 * have the classes the property requires? Open world (RDF 1.1 Semantics): a missing class is what
 * entailment would add, so only a `warning`; a type declared disjoint with a required class is a
 * contradiction, an `error`. `closedWorld` makes a missing class an error too. The answer is the
 * same for every entity with the same type set, so it is cached per (property, type set).
 */
export function checkTypeRequirement(ctx: CheckContext, kind: 'domain' | 'range', p: number, triples: Iterable<number>, required: readonly number[]): Finding[] {
  const { graph, schema } = ctx;
  const column = kind === 'domain' ? graph.s : graph.o;
  const cache = new Map<number, Omit<ReportInput, 'triple'> | null>();
  const findings: Finding[] = [];
  for (const t of triples) {
    const entity = column[t]!;
    const setIndex = schema.typeSetIndex(entity);
    let verdict = cache.get(setIndex);
    if (verdict === undefined) {
      verdict = judge(ctx, kind, p, setIndex, required);
      cache.set(setIndex, verdict);
    }
    if (verdict) findings.push(ctx.finding({ ...verdict, triple: t, data: { ...verdict.data, entity: shortName(graph.terms.key(entity)) } }));
  }
  return findings;
}

function judge(ctx: CheckContext, kind: 'domain' | 'range', p: number, setIndex: number, required: readonly number[]): Omit<ReportInput, 'triple'> | null {
  const { schema, options } = ctx;
  const types = schema.typeSet(setIndex);
  const missing = required.filter((c) => !types.has.has(c));
  if (missing.length === 0) return null;
  const conflicts: Array<{ type: string; disjointWith: string; required: string; declaredAt?: string }> = [];
  for (const c of missing) {
    const clash = schema.conflictsWith(c);
    for (const t of types.closed) {
      if (!clash.has(t)) continue;
      // Name the declared axiom: t is disjoint with some superclass of c.
      const sup = schema.superClasses(c).find((s) => schema.disjointWith(s).has(t)) ?? c;
      const declaredAt = at(schema.axiomSource('disjointWith', t, sup));
      conflicts.push({ type: schema.key(t), disjointWith: schema.key(sup), required: schema.key(c), ...(declaredAt ? { declaredAt } : {}) });
    }
  }
  const declaredBy = missing.map((c) => {
    const via = schema.declaringProperty(kind, p, c);
    return compact({ class: schema.key(c), property: schema.key(via), declaredAt: at(schema.axiomSource(kind, via, c)) });
  });
  const evidence = compact({
    required: keysOf(schema, required),
    missing: keysOf(schema, missing),
    asserted: keysOf(schema, types.asserted),
    conflicts: conflicts.length > 0 ? conflicts : undefined,
    declaredBy,
    openWorld: !options.closedWorld,
  });
  const data = { predicate: shortName(schema.key(p)), expected: names(keysOf(schema, missing)) };
  if (conflicts.length > 0) {
    const first = conflicts[0]!;
    return { messageId: 'disjoint', severity: 'error', evidence, data: { ...data, type: shortName(first.type), other: shortName(first.disjointWith) } };
  }
  if (types.asserted.length === 0) return { messageId: 'untyped', severity: options.closedWorld ? 'error' : 'warning', evidence, data };
  return { messageId: 'missingType', severity: options.closedWorld ? 'error' : 'warning', evidence, data: { ...data, types: names(keysOf(schema, types.asserted)) } };
}
