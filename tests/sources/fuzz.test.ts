import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { PlumbError } from '../../src/errors.js';
import type { InputFormat, ReadResult } from '../../src/sources/index.js';
import { countsAddUp, readText, triplesOf } from './helpers.js';

/**
 * Property-based tests: whatever the input, a non-strict read either finishes with counts that add up
 * and positions that point into the input, or stops with a PlumbError (binary data) — never another
 * exception, never a hang; and the way the bytes are cut into chunks never changes the result.
 */

const FORMATS: InputFormat[] = ['ntriples', 'nquads', 'turtle', 'trig', 'csv', 'tsv'];

const VALID: Record<InputFormat, string> = {
  ntriples:
    '<http://example.org/a> <http://example.org/p> <http://example.org/b> .\n' +
    '_:x <http://example.org/p> "v\\n1"@en .\n' +
    '<http://example.org/a> <http://example.org/q> "5"^^<http://www.w3.org/2001/XMLSchema#integer> .\n',
  nquads:
    '<http://example.org/a> <http://example.org/p> <http://example.org/b> <http://example.org/g> .\n' +
    '<http://example.org/a> <http://example.org/p> "x" .\n',
  turtle:
    '@prefix ex: <http://example.org/> .\nex:a ex:p ex:b , ex:c ;\n  ex:q [ ex:r "s" ] .\nex:d ex:p ( 1 2.5 true ) .\n',
  trig: '@prefix ex: <http://example.org/> .\nex:g { ex:a ex:p ex:b . }\nex:a ex:p "t" .\n',
  csv: 'subject,predicate,object\na,p,b\n"c d",p,"x, ""y"""\ne,p,"line\nbreak"\n',
  tsv: 'a\tp\tb\nc\tp\t"lit"@en\n',
};

/** Characters that matter to the grammars, so random inputs hit the interesting paths. */
const SYNTAX = [
  '<',
  '>',
  '"',
  "'",
  '\\',
  '.',
  ';',
  ',',
  '[',
  ']',
  '(',
  ')',
  '{',
  '}',
  '@',
  '^',
  '_',
  ':',
  ' ',
  '\t',
  '\n',
  '\r',
  '#',
  'a',
  'x',
  '1',
  'é',
  '😀',
  '\ufeff',
];

const syntaxText = fc.array(fc.constantFrom(...SYNTAX), { maxLength: 200 }).map((cs) => cs.join(''));
const anyText = fc.string({ unit: 'grapheme', maxLength: 200 }).map((s) => s.replace(/\0/g, ''));

type Mutation = {
  kind: 'delete' | 'insert' | 'duplicate' | 'truncate';
  at: number;
  span: number;
  char: string;
};
const mutation = fc.record({
  kind: fc.constantFrom<Mutation['kind']>('delete', 'insert', 'duplicate', 'truncate'),
  at: fc.nat(),
  span: fc.integer({ min: 1, max: 12 }),
  char: fc.constantFrom(...SYNTAX),
});

function mutate(text: string, mutations: Mutation[]): string {
  let out = text;
  for (const m of mutations) {
    const at = out.length === 0 ? 0 : m.at % out.length;
    if (m.kind === 'delete') out = out.slice(0, at) + out.slice(at + m.span);
    else if (m.kind === 'insert') out = out.slice(0, at) + m.char + out.slice(at);
    else if (m.kind === 'duplicate')
      out = out.slice(0, at + m.span) + out.slice(at, at + m.span) + out.slice(at + m.span);
    else out = out.slice(0, at);
  }
  return out;
}

function checkResult(r: ReadResult, text: string): void {
  expect(countsAddUp(r)).toBe(true);
  const lines = text.split(/\r\n|\r|\n/).length;
  for (const x of r.rejections) {
    expect(x.line).toBeGreaterThanOrEqual(1);
    expect(x.line).toBeLessThanOrEqual(lines);
    expect(x.column).toBeGreaterThanOrEqual(1);
    expect(x.text.length).toBeLessThanOrEqual(200);
  }
  for (const line of r.graph.provenance.line) expect(line).toBeLessThanOrEqual(lines);
  expect(r.graph.size).toBe(r.accounting.accepted);
}

async function readOrPlumbError(
  text: string | Buffer[],
  format: InputFormat,
): Promise<ReadResult | PlumbError> {
  try {
    return await readText(text, format);
  } catch (error) {
    if (error instanceof PlumbError) return error;
    throw error;
  }
}

function cutAt(bytes: Buffer, cuts: number[]): Buffer[] {
  const points = [...new Set(cuts.map((c) => c % (bytes.length + 1)))].sort((a, b) => a - b);
  const out: Buffer[] = [];
  let from = 0;
  for (const p of points) {
    out.push(bytes.subarray(from, p));
    from = p;
  }
  out.push(bytes.subarray(from));
  return out;
}

describe('fuzzing the readers', () => {
  for (const format of FORMATS) {
    it(`${format}: random text never escapes the reader and the counts add up`, async () => {
      await fc.assert(
        fc.asyncProperty(fc.oneof(syntaxText, anyText), async (text) => {
          const r = await readText(text, format);
          checkResult(r, text);
        }),
        { numRuns: 60 },
      );
    });

    it(`${format}: mutated valid input never escapes the reader and reads the same in any chunks`, async () => {
      await fc.assert(
        fc.asyncProperty(
          fc.array(mutation, { minLength: 1, maxLength: 4 }),
          fc.array(fc.nat(), { maxLength: 8 }),
          async (mutations, cuts) => {
            const text = mutate(VALID[format], mutations);
            const whole = await readText(text, format);
            checkResult(whole, text);
            const pieces = await readText(cutAt(Buffer.from(text), cuts), format);
            expect(triplesOf(pieces.graph)).toEqual(triplesOf(whole.graph));
            expect(pieces.rejections).toEqual(whole.rejections);
          },
        ),
        { numRuns: 60 },
      );
    });
  }

  it('arbitrary bytes: a result whose counts add up, or a PlumbError — nothing else', async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.uint8Array({ maxLength: 300 }),
        fc.constantFrom(...FORMATS),
        async (bytes, format) => {
          const out = await readOrPlumbError([Buffer.from(bytes)], format);
          if (out instanceof PlumbError) expect(out.exitCode).toBe(2);
          else expect(countsAddUp(out)).toBe(true);
        },
      ),
      { numRuns: 150 },
    );
  });

  it('N-Triples built from known-good and known-bad lines: exactly the bad lines are rejected, every good one kept', async () => {
    const good = [
      (i: number) => `<http://x.example/s${i}> <http://x.example/p> <http://x.example/o${i % 3}> .`,
      (i: number) => `_:b${i % 4} <http://x.example/p> "lit ${i}"@en .`,
      (i: number) =>
        `<http://x.example/s${i}> <http://x.example/q> "${i}"^^<http://www.w3.org/2001/XMLSchema#integer> .`,
    ];
    const bad = [
      (i: number) => `<http://x.example/s${i} <http://x.example/p> <http://x.example/o> .`,
      (i: number) => `<http://x.example/s${i}> <http://x.example/p> "open .`,
      (i: number) => `<http://x.example/s${i}> <http://x.example/p> <http://x.example/o>`,
      (i: number) => `<http://x.example/s${i}> <http://x.example/p> .`,
      (i: number) => `"lit" <http://x.example/p> <http://x.example/o${i}> .`,
      (i: number) =>
        `<http://x.example/s${i}> <http://x.example/p> <http://x.example/o> <http://x.example/g> .`,
      () => 'not a triple at all',
    ];
    const neutral = ['', '# a comment', '   '];
    const line = fc.oneof(
      fc.record({ kind: fc.constant('good' as const), at: fc.nat(good.length - 1) }),
      fc.record({ kind: fc.constant('bad' as const), at: fc.nat(bad.length - 1) }),
      fc.record({ kind: fc.constant('neutral' as const), at: fc.nat(neutral.length - 1) }),
    );
    await fc.assert(
      fc.asyncProperty(
        fc.array(line, { maxLength: 25 }),
        fc.constantFrom('\n', '\r\n'),
        async (lines, eol) => {
          const texts = lines.map((l, i) =>
            l.kind === 'good' ? good[l.at]!(i) : l.kind === 'bad' ? bad[l.at]!(i) : neutral[l.at]!,
          );
          const r = await readText(texts.join(eol), 'ntriples');
          const badLines = lines.flatMap((l, i) => (l.kind === 'bad' ? [i + 1] : []));
          const goodLines = lines.flatMap((l, i) => (l.kind === 'good' ? [i + 1] : []));
          expect(r.rejections.map((x) => x.line)).toEqual(badLines);
          expect(r.accounting.accepted + r.accounting.duplicates).toBe(goodLines.length);
          expect([...new Set(r.graph.provenance.line)].every((n) => goodLines.includes(n))).toBe(true);
        },
      ),
      { numRuns: 200 },
    );
  });

  it('TSV built from known-good and known-bad rows: exactly the bad rows are rejected', async () => {
    const good = [
      (i: number) => `s${i}\tp\to${i % 3}`,
      (i: number) => `s${i}\tp\t"v ${i}"@en`,
      (i: number) => `<http://x.example/s${i}>\tp\t_:b`,
    ];
    const bad = [
      (i: number) => `s${i}\tp`,
      (i: number) => `"lit"\tp\to${i}`,
      (i: number) => `s${i}\t\to`,
      (i: number) => `s${i}\t_:p\to`,
    ];
    const neutral = ['', '# a comment'];
    const row = fc.oneof(
      fc.record({ kind: fc.constant('good' as const), at: fc.nat(good.length - 1) }),
      fc.record({ kind: fc.constant('bad' as const), at: fc.nat(bad.length - 1) }),
      fc.record({ kind: fc.constant('neutral' as const), at: fc.nat(neutral.length - 1) }),
    );
    await fc.assert(
      fc.asyncProperty(fc.array(row, { maxLength: 25 }), async (rows) => {
        const texts = rows.map((l, i) =>
          l.kind === 'good' ? good[l.at]!(i) : l.kind === 'bad' ? bad[l.at]!(i) : neutral[l.at]!,
        );
        const r = await readText(texts.join('\n'), 'tsv');
        expect(r.rejections.map((x) => x.line)).toEqual(
          rows.flatMap((l, i) => (l.kind === 'bad' ? [i + 1] : [])),
        );
        expect(r.accounting.accepted + r.accounting.duplicates).toBe(
          rows.filter((l) => l.kind === 'good').length,
        );
      }),
      { numRuns: 150 },
    );
  });

  it('the valid samples are valid', async () => {
    for (const format of FORMATS) {
      const r = await readText(VALID[format], format);
      expect(r.rejections, format).toEqual([]);
      expect(r.graph.size, format).toBeGreaterThan(1);
    }
  });
});
