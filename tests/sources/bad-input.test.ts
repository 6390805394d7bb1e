import { mkdtempSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { afterAll, describe, expect, it } from 'vitest';
import { rmSync } from 'node:fs';
import { PlumbError } from '../../src/errors.js';
import { readGraph } from '../../src/sources/index.js';
import { countsAddUp, readText } from './helpers.js';

const dir = mkdtempSync(join(os.tmpdir(), 'plumb-bad-input-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const LINE = '<http://example.org/a> <http://example.org/p> <http://example.org/b> .\n';
const lines = (n: number): string =>
  Array.from({ length: n }, (_, i) => `<http://example.org/s${i}> <http://example.org/p> "${i}" .\n`).join(
    '',
  );

/** The error a read ends with; fails the test when the read succeeds. */
async function failure(promise: Promise<unknown>): Promise<PlumbError> {
  const error = await promise.then(
    () => undefined,
    (e: unknown) => e,
  );
  expect(error).toBeInstanceOf(PlumbError);
  const e = error as PlumbError;
  expect(e.exitCode).toBe(2);
  expect(e.message).not.toMatch(/\n/);
  expect(e.stack ?? '').not.toBe('');
  return e;
}

describe('inputs that cannot be read', () => {
  it('a missing file', async () => {
    const e = await failure(readGraph([join(dir, 'missing.nt')]));
    expect(e.code).toBe('E_INPUT');
    expect(e.message).toBe(`no such file: ${join(dir, 'missing.nt')}`);
  });

  it('a directory', async () => {
    const e = await failure(readGraph([dir], { format: 'ntriples' }));
    expect(e.message).toMatch(/is a directory/);
  });

  it('an unknown format, before anything is read', async () => {
    const e = await failure(readGraph([join(dir, 'data.xyz')]));
    expect(e.code).toBe('E_FORMAT');
    expect(e.hint).toMatch(/--format/);
  });

  it('a truncated .gz: an error naming the file and the line reached', async () => {
    const gz = gzipSync(Buffer.from(lines(20_000)));
    const path = join(dir, 'cut.nt.gz');
    writeFileSync(path, gz.subarray(0, Math.floor(gz.length / 2)));
    const e = await failure(readGraph([path]));
    expect(e.message).toMatch(/gzip data is truncated or damaged/);
    expect(e.position?.file).toBe(path);
    expect(e.position?.line).toBeGreaterThan(1);
  });

  it('binary data', async () => {
    const path = join(dir, 'image.nt');
    const bytes = Buffer.alloc(4096);
    for (let i = 0; i < bytes.length; i++) bytes[i] = (i * 7919) % 256;
    writeFileSync(path, bytes);
    const e = await failure(readGraph([path]));
    expect(e.message).toMatch(/does not look like a text graph file/);
  });
});

describe('malformed statements', () => {
  it('an unterminated IRI: a rejection with its position, then the rest of the file', async () => {
    const r = await readText(
      `${LINE}<http://example.org/a> <http://example.org/p <http://example.org/c> .\n${LINE.replace('/b>', '/d>')}`,
      'ntriples',
    );
    expect(r.rejections).toEqual([
      {
        file: '-',
        line: 2,
        column: 24,
        reason: expect.stringMatching(/^unterminated IRI/) as unknown as string,
        text: '<http://example.org/a> <http://example.org/p <http://example.org/c> .',
      },
    ]);
    expect(r.graph.size).toBe(2);
  });

  it('a 10 MB literal is read whole, in one piece or in small chunks', async () => {
    const big = 'x'.repeat(10 * 1024 * 1024);
    const text = `${LINE}<http://example.org/a> <http://example.org/p> "${big}" .\n${LINE}`;
    const whole = await readText(text, 'ntriples');
    expect(whole.accounting).toMatchObject({ read: 3, accepted: 2, duplicates: 1 });
    const chunks: string[] = [];
    for (let i = 0; i < text.length; i += 65536) chunks.push(text.slice(i, i + 65536));
    const chunked = await readText(chunks, 'ntriples');
    expect(chunked.graph.terms.allKeys()).toEqual(whole.graph.terms.allKeys());
  });

  it('a line longer than the limit becomes a rejection (or an error under --strict)', async () => {
    const { textBatches } = await import('../../src/sources/text.js');
    const batches: string[] = [];
    const problems: number[] = [];
    async function* chunks(): AsyncGenerator<string> {
      yield 'short line\n';
      for (let i = 0; i < 10; i++) yield 'y'.repeat(1000);
      yield '\nnext\n';
    }
    for await (const b of textBatches(chunks(), { file: 'f', strict: false, maxLineLength: 5000 })) {
      batches.push(b.text);
      problems.push(...b.problems.map((p) => p.line));
    }
    expect(batches.join('')).toBe('short line\n\nnext\n');
    expect(problems).toEqual([2]);
    const strict = textBatches(chunks(), { file: 'f', strict: true, maxLineLength: 5000 });
    await expect(
      (async () => {
        for await (const _ of strict) void _;
      })(),
    ).rejects.toThrow(/longer than/);
  });

  it('invalid UTF-8: the line is rejected with the byte, the rest is read', async () => {
    const bytes = Buffer.concat([
      Buffer.from(LINE),
      Buffer.from('<http://example.org/a> <http://example.org/p> "caf'),
      Buffer.from([0xe9]),
      Buffer.from('" .\n'),
      Buffer.from(LINE.replace('/b>', '/c>')),
    ]);
    const r = await readText(bytes, 'ntriples');
    expect(countsAddUp(r)).toBe(true);
    expect(r.accounting).toMatchObject({ read: 3, accepted: 2, rejected: 1 });
    expect(r.rejections[0]).toMatchObject({ line: 2, column: 51, reason: 'invalid UTF-8 (byte 0xE9)' });
    const e = await failure(readText(bytes, 'ntriples', { strict: true }));
    expect(e.position).toEqual({ file: '-', line: 2, column: 51 });
  });

  it('invalid UTF-8 inside a Turtle statement rejects that statement once', async () => {
    const bytes = Buffer.concat([
      Buffer.from('@prefix ex: <http://example.org/> .\nex:a ex:p ex:b ;\n  ex:q "x'),
      Buffer.from([0xff]),
      Buffer.from('" ;\n  ex:r ex:c .\nex:d ex:p ex:e .\n'),
    ]);
    const r = await readText(bytes, 'turtle');
    expect(countsAddUp(r)).toBe(true);
    expect(r.rejections).toHaveLength(1);
    expect(r.rejections[0]!.line).toBe(3);
    expect(r.graph.size).toBe(3);
  });
});
