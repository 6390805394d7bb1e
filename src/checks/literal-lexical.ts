import type { Finding } from '../findings.js';
import { row } from '../graph/store.js';
import { literalParts } from '../graph/terms.js';
import { isWellFormedLanguageTag } from '../schema/lang-tag.js';
import { shortName } from '../schema/vocab.js';
import { isCheckedDatatype, isUnusableUri, lexicalProblem, type LexicalProblem } from '../schema/xsd.js';
import type { Check, ReportInput } from './types.js';
import { datatypeOfKey } from './util.js';

const WHY: Record<LexicalProblem, string> = {
  syntax: 'is not in its lexical space',
  day: 'names a day that month does not have',
  bounds: 'is outside the value range of the datatype',
  chars: 'holds characters XML does not allow',
};

/**
 * Typed literals whose lexical form is outside their datatype's lexical space (XSD 1.1 Part 2,
 * for the datatypes in `src/schema/xsd.ts`; RDF 1.1 Concepts §3.3 calls them ill-typed), and
 * language tags that are not well-formed BCP 47 (RFC 5646 §2.1). Each distinct literal is checked
 * once, then reported on every triple that uses it.
 */
export const literalLexical: Check = {
  meta: {
    id: 'literal-lexical',
    title: 'Ill-typed literal or malformed language tag',
    severity: 'error',
    description:
      'A literal typed xsd:integer, decimal, double, float, boolean, date, dateTime, gYear, anyURI (or a ' +
      'derived integer type) whose lexical form is not valid for the type (XSD 1.1 Part 2), or a language tag ' +
      'that is not well-formed BCP 47.',
    messages: {
      illTyped: '{value} {why} ({datatype})',
      languageTag: 'the language tag "{tag}" of {value} is not a well-formed BCP 47 tag',
      unusableUri: '{value} is a valid xsd:anyURI but not a usable IRI (it has spaces or characters IRIs exclude)',
    },
  },
  run(ctx) {
    const { graph } = ctx;
    const keys = graph.terms.allKeys();
    const findings: Finding[] = [];
    const offsets = graph.byObject.offsets;
    for (let term = 0; term + 1 < offsets.length; term++) {
      if (offsets[term + 1] === offsets[term]) continue;
      const key = keys[term]!;
      if (key.charCodeAt(0) !== 34) continue;
      const report = judge(key);
      if (report) for (const t of row(graph.byObject, term)) findings.push(ctx.finding({ ...report, triple: t }));
    }
    return findings;
  },
};

function judge(key: string): Omit<ReportInput, 'triple'> | undefined {
  const datatype = datatypeOfKey(key);
  const shown = key.length > 80 ? `${key.slice(0, 77)}…` : key;
  if (isCheckedDatatype(datatype)) {
    const { lexical } = literalParts(key);
    const problem = lexicalProblem(lexical, datatype);
    if (problem) {
      return { messageId: 'illTyped', data: { value: shown, why: WHY[problem], datatype: shortName(datatype) }, evidence: { datatype, lexical, problem } };
    }
    if (datatype.endsWith('#anyURI') && isUnusableUri(lexical)) {
      return { messageId: 'unusableUri', severity: 'note', data: { value: shown }, evidence: { datatype, lexical } };
    }
    return undefined;
  }
  if (key.charCodeAt(key.length - 1) !== 34 && !key.endsWith('>')) {
    const tag = key.slice(key.lastIndexOf('"@') + 2);
    if (!isWellFormedLanguageTag(tag)) return { messageId: 'languageTag', data: { tag, value: shown }, evidence: { tag } };
  }
  return undefined;
}
