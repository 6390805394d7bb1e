import { describe, expect, it } from 'vitest';
import type { InputFormat, ReadResult } from '../../src/sources/index.js';
import { readText, tinyByteChunks, tinyChunks, triplesOf } from './helpers.js';

/**
 * Reading is streamed: the same input cut anywhere — one or two characters at a time, a byte order
 * mark in its own chunk, a multi-byte character or a CRLF split between chunks — must read exactly as
 * the whole input does, rejections included.
 */

const SAMPLES: Record<InputFormat, string> = {
  ntriples: [
    '# comment line',
    '<http://example.org/a> <http://example.org/p> <http://example.org/b> .',
    '<http://example.org/a> <http://example.org/p> "naïve café 😀"@fr .',
    '<http://example.org/a> <http://example.org/p <http://example.org/c> .',
    '',
    '_:x <http://example.org/p> "1"^^<http://www.w3.org/2001/XMLSchema#integer> .',
    '<http://example.org/a> <http://example.org/p> "esc \\" \\u00e9" .',
    '',
  ].join('\r\n'),
  nquads: [
    '<http://example.org/a> <http://example.org/p> <http://example.org/b> <http://example.org/g> .',
    '<http://example.org/a> <http://example.org/p> "ünï" _:g .',
    '<http://example.org/a> <http://example.org/p> .',
    '<http://example.org/a> <http://example.org/p> <http://example.org/b> .',
  ].join('\n'),
  turtle: [
    '@prefix ex: <http://example.org/> .',
    'ex:a ex:p ex:b , "ß" ; ex:q [ ex:r 1.5e3 ] .',
    'ex:a ex:p """long',
    'text ✓""" .',
    'ex:a ex:p .',
    'ex:c ex:p ( ex:x ex:y ) .',
  ].join('\n'),
  trig: [
    '@prefix ex: <http://example.org/> .',
    'ex:g { ex:a ex:p ex:b . ex:a ex:p "ø" }',
    'ex:a ex:p ex:c ex:d .',
    'ex:a ex:p ex:c .',
    '',
  ].join('\n'),
  csv: 'subject,predicate,object\na,p,"x, ""y"""\r\nb,p,"multi\r\nline é"\r\nc,p,"open\r\nd,p,e\r\n',
  tsv: 'a\tp\tb\n# note\nb\tp\tü\nshort\n',
};

function summary(r: ReadResult): unknown {
  return {
    accounting: r.accounting,
    triples: triplesOf(r.graph),
    lines: Array.from(r.graph.provenance.line),
    rejections: r.rejections.map(({ line, column, reason }) => ({ line, column, reason })),
  };
}

describe('chunk boundaries', () => {
  for (const [format, text] of Object.entries(SAMPLES) as [InputFormat, string][]) {
    it(`${format}: 1–2 characters at a time reads as the whole`, async () => {
      const whole = summary(await readText(text, format));
      expect(summary(await readText(tinyChunks(text), format))).toEqual(whole);
    });

    it(`${format}: 1–2 bytes at a time, BOM in its own chunk, reads as the whole`, async () => {
      const whole = summary(await readText(text, format));
      const bytes = tinyByteChunks(Buffer.from(text, 'utf8'));
      const withBom = [Buffer.from([0xef, 0xbb, 0xbf]), ...bytes];
      expect(summary(await readText(withBom, format))).toEqual(whole);
      const bomSplit = [Buffer.from([0xef]), Buffer.from([0xbb]), Buffer.from([0xbf]), ...bytes];
      expect(summary(await readText(bomSplit, format))).toEqual(whole);
    });
  }

  it('the samples are not trivial: they hold triples and rejections', async () => {
    for (const [format, text] of Object.entries(SAMPLES) as [InputFormat, string][]) {
      const r = await readText(text, format);
      expect(r.graph.size, format).toBeGreaterThan(1);
      expect(r.rejections.length, format).toBeGreaterThan(0);
    }
  });

  it('a BOM is dropped only at the very start', async () => {
    const r = await readText(
      ['\ufeff', '<http://example.org/a> <http://example.org/p> "\ufeffx" .\n'],
      'ntriples',
    );
    expect(triplesOf(r.graph)[0]).toBe('<http://example.org/a> <http://example.org/p> "\ufeffx"');
  });
});
