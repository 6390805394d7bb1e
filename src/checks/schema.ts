import type { Check } from './types.js';

/**
 * Problems in the schema and shapes themselves (`SchemaIssue`s): subclass cycles, malformed axioms
 * and shapes, invalid sh:pattern expressions, SHACL outside the subset. Reported as findings so a
 * shapes file is never silently half-evaluated; the source points into the schema or shapes file.
 */
export const schema: Check = {
  meta: {
    id: 'schema',
    title: 'Problem in the schema or shapes',
    severity: 'warning',
    description:
      'A schema or shapes file states something plumb cannot use as written: a subclass or sub-property cycle ' +
      '(warning), a malformed axiom or shape, an invalid sh:pattern (error), or SHACL outside the supported ' +
      'subset (warning: that part was not evaluated).',
    messages: { issue: '{message}' },
  },
  run(ctx) {
    return ctx.schema.issues.map((issue) =>
      ctx.finding({
        messageId: 'issue',
        severity: issue.severity,
        subject: issue.subject,
        predicate: issue.predicate,
        object: issue.object,
        data: { message: issue.message },
        evidence: { code: issue.code },
        ...(issue.source ? { source: issue.source } : {}),
      }),
    );
  },
};
