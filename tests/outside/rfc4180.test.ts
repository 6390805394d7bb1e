import { describe, expect, it } from 'vitest';
import type { Graph } from '../../src/graph/store.js';
import { literalParts, termKind, TermKind } from '../../src/graph/terms.js';
import { DEFAULT_BASE_IRI } from '../../src/sources/index.js';
import { readText } from '../sources/helpers.js';

/**
 * RFC 4180 ("Common Format and MIME Type for Comma-Separated Values (CSV) Files", October 2005),
 * §2 "Definition of the CSV Format", rules 1–7 and its examples, read through plumb's CSV reader.
 * The cells come back as the objects of the triples: a cell with a space, a quote or a line break is
 * a literal (plumb's rule for cells), so its exact value can be checked.
 */

/** The field values of the object column, in row order. */
function objectCells(graph: Graph): string[] {
  return Array.from(graph.o, (o) => {
    const key = graph.terms.key(o);
    if (termKind(key) === TermKind.Literal) return literalParts(key).lexical;
    return key.startsWith(DEFAULT_BASE_IRI) ? key.slice(DEFAULT_BASE_IRI.length) : key;
  });
}

describe('RFC 4180 §2', () => {
  it('rule 1: records end with CRLF; rule 2: the last may end without one', async () => {
    // Source: RFC 4180 §2 rules 1 and 2, with the rules' own example records "aaa,bbb,ccc" / "zzz,yyy,xxx".
    const r = await readText('aaa,bbb,ccc\r\nzzz,yyy,xxx', 'csv', { header: false });
    expect(r.accounting.read).toBe(2);
    expect(objectCells(r.graph)).toEqual(['ccc', 'xxx']);
    expect(Array.from(r.graph.provenance.line)).toEqual([1, 2]);
  });

  it('rule 3: an optional header line in the same format as the records', async () => {
    // Source: RFC 4180 §2 rule 3 ("field_name,field_name,field_name CRLF").
    const r = await readText('subject,predicate,object\r\naaa,bbb,ccc\r\nzzz,yyy,xxx\r\n', 'csv');
    expect(r.accounting.read).toBe(2);
    expect(Array.from(r.graph.provenance.line)).toEqual([2, 3]);
  });

  it('rule 4: spaces are part of a field', async () => {
    // Source: RFC 4180 §2 rule 4 ("Spaces are considered part of a field and should not be ignored").
    const r = await readText('a,p, two words \r\n', 'csv', { header: false });
    expect(objectCells(r.graph)).toEqual([' two words ']);
  });

  it('rule 6: fields with commas and line breaks are enclosed in double quotes', async () => {
    // Source: RFC 4180 §2 rule 6 and its example: "aaa","b CRLF bb","ccc" CRLF zzz,yyy,xxx.
    const r = await readText('"aaa","b\r\nbb","ccc, ddd"\r\nzzz,yyy,xxx', 'csv', { header: false });
    expect(r.accounting.read).toBe(2);
    expect(objectCells(r.graph)).toEqual(['ccc, ddd', 'xxx']);
    expect(r.graph.terms.key(r.graph.p[0]!)).toBe(`${DEFAULT_BASE_IRI}b%0D%0Abb`);
    // The first record spans lines 1–2, the second starts on line 3.
    expect(Array.from(r.graph.provenance.line)).toEqual([1, 3]);
  });

  it('rule 7: a double quote inside a quoted field is written twice', async () => {
    // Source: RFC 4180 §2 rule 7 and its example: "aaa","b""bb","ccc".
    const r = await readText('"aaa","b""bb","c""cc"', 'csv', { header: false });
    expect(objectCells(r.graph)).toEqual(['c"cc']);
    expect(r.graph.terms.key(r.graph.p[0]!)).toBe(`${DEFAULT_BASE_IRI}b%22bb`);
  });

  it('a quoted line break inside a literal keeps its CRLF exactly', async () => {
    // Source: RFC 4180 §2 rule 6 (line breaks are field content when quoted).
    const r = await readText('a,p,"first line\r\nsecond line"\r\nb,p,c\r\n', 'csv', { header: false });
    expect(objectCells(r.graph)).toEqual(['first line\r\nsecond line', 'c']);
  });

  it('rule 5: a quote may not appear in an unquoted field; plumb keeps it as written', async () => {
    // Source: RFC 4180 §2 rule 5. plumb is lenient here (common practice): the quote is kept, the row is read.
    const r = await readText('a,p,say "hi"\r\n', 'csv', { header: false });
    expect(objectCells(r.graph)).toEqual(['say "hi"']);
  });
});
