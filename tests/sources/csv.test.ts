import { describe, expect, it } from 'vitest';
import { PlumbError } from '../../src/errors.js';
import { DEFAULT_BASE_IRI } from '../../src/sources/index.js';
import { countsAddUp, readText, triplesOf } from './helpers.js';

const U = (local: string): string => `<${DEFAULT_BASE_IRI}${local}>`;

describe('CSV and TSV', () => {
  it('reads a TSV edge list with bare tokens as IRIs under the default base', async () => {
    const r = await readText('a\tlikes\tb\nb\tlikes\t42\n', 'tsv');
    expect(triplesOf(r.graph)).toEqual([
      `${U('a')} ${U('likes')} ${U('b')}`,
      `${U('b')} ${U('likes')} ${U('42')}`,
    ]);
    expect(Array.from(r.graph.provenance.line)).toEqual([1, 2]);
  });

  it('places bare cells under --base-iri and keeps absolute IRIs and <IRIs> as they are', async () => {
    const r = await readText('a,p,http://other.example/x\na,p,<urn:isbn:123>\n_:n,p,b\n', 'csv', {
      baseIri: 'https://kg.example/',
    });
    expect(triplesOf(r.graph)).toEqual([
      '<https://kg.example/a> <https://kg.example/p> <http://other.example/x>',
      '<https://kg.example/a> <https://kg.example/p> <urn:isbn:123>',
      '_:f0_n <https://kg.example/p> <https://kg.example/b>',
    ]);
  });

  it('turns object cells in N-Triples literal form, or with spaces, into literals', async () => {
    const text =
      'subject,predicate,object\nx,name,"""Nel Varo""@en"\nx,age,"""42""^^xsd:integer"\nx,note,two words\nx,code,"""a\\tb"""\n';
    const r = await readText(text, 'csv');
    expect(triplesOf(r.graph).map((t) => t.split(' ').slice(2).join(' '))).toEqual([
      '"Nel Varo"@en',
      '"42"^^<http://www.w3.org/2001/XMLSchema#integer>',
      '"two words"',
      '"a\\tb"'.replace('\\t', '\t'),
    ]);
  });

  it('recognises a header by its role names and maps columns by name or position', async () => {
    const header = await readText('head,relation,tail\na,p,b\n', 'csv');
    expect(header.accounting.read).toBe(1);
    const named = await readText('id,to,rel,from\n1,b,p,a\n', 'csv', { columns: 'from,rel,to' });
    expect(triplesOf(named.graph)).toEqual([`${U('a')} ${U('p')} ${U('b')}`]);
    const positions = await readText('b;p;a\n', 'csv', { columns: '2,1,0', delimiter: ';' });
    expect(triplesOf(positions.graph)).toEqual([`${U('a')} ${U('p')} ${U('b')}`]);
    const noHeader = await readText('subject,predicate,object\n', 'csv', { header: false });
    expect(noHeader.accounting.read).toBe(1);
  });

  it('reads a fourth column as the named graph', async () => {
    const r = await readText('a\tp\tb\tg1\na\tp\tb\t\n', 'tsv', { columns: '0,1,2,3' });
    expect(Array.from(r.graph.g).map((g) => (g < 0 ? '-' : r.graph.terms.key(g)))).toEqual([
      `${DEFAULT_BASE_IRI}g1`,
      '-',
    ]);
  });

  it('skips blank lines and # comments, and rejects short rows and literal subjects with their line', async () => {
    const r = await readText('# exported edges\na\tp\tb\n\n\t\t\nshort\trow\n"lit"\tp\tb\nc\tp\td\n', 'tsv');
    expect(countsAddUp(r)).toBe(true);
    expect(r.accounting).toMatchObject({ read: 4, accepted: 2, rejected: 2 });
    expect(r.rejections.map((x) => [x.line, x.reason])).toEqual([
      [5, 'the row has 2 cells, the column mapping needs 3'],
      [6, 'a literal cannot be a subject: "lit"'],
    ]);
  });

  it('rejects a row whose quote never closes and reads on from the next line', async () => {
    const r = await readText('a,p,b\nc,p,"open\nd,p,e\n', 'csv');
    expect(r.rejections.map((x) => [x.line, x.column])).toEqual([[2, 5]]);
    expect(triplesOf(r.graph)).toEqual([`${U('a')} ${U('p')} ${U('b')}`, `${U('d')} ${U('p')} ${U('e')}`]);
  });

  it('fails with a usage error when a named column is missing', async () => {
    const error = await readText('a,b,c\n1,2,3\n', 'csv', { columns: 'subject,predicate,object' }).catch(
      (e: unknown) => e,
    );
    expect(error).toBeInstanceOf(PlumbError);
    expect((error as PlumbError).message).toMatch(/column "subject" is not in the header/);
    expect((error as PlumbError).hint).toMatch(/a, b, c/);
  });

  it('refuses --columns of the wrong length', async () => {
    await expect(readText('a,b,c\n', 'csv', { columns: 'a,b' })).rejects.toThrow(/3 or 4/);
  });
});
