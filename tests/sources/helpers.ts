import { Readable } from 'node:stream';
import type { Graph } from '../../src/graph/store.js';
import { toNTriples } from '../../src/graph/terms.js';
import { readGraph, type InputFormat, type ReadOptions, type ReadResult } from '../../src/sources/index.js';

/** Reads `input` through the same path as a file (standard input), in the given chunks. */
export function readText(
  input: string | Buffer | ReadonlyArray<string | Buffer>,
  format: InputFormat,
  options: Omit<ReadOptions, 'format' | 'stdin'> = {},
): Promise<ReadResult> {
  const chunks = typeof input === 'string' || Buffer.isBuffer(input) ? [input] : input;
  return readGraph(['-'], { ...options, format, stdin: Readable.from(chunks) });
}

/** The triples of a graph as N-Triples-like strings, in store order (graph name appended for quads). */
export function triplesOf(graph: Graph): string[] {
  const out: string[] = [];
  const t = graph.terms;
  for (let i = 0; i < graph.size; i++) {
    const g = graph.g[i]!;
    out.push(
      `${toNTriples(t.key(graph.s[i]!))} ${toNTriples(t.key(graph.p[i]!))} ${toNTriples(t.key(graph.o[i]!))}` +
        (g >= 0 ? ` ${toNTriples(t.key(g))}` : ''),
    );
  }
  return out;
}

/** `read = accepted + duplicates + rejected`, per file and in total. */
export function countsAddUp(result: ReadResult): boolean {
  const a = result.accounting;
  const perFile = result.inputs.reduce((n, i) => n + i.statements, 0);
  return (
    a.read === a.accepted + a.duplicates + a.rejected &&
    a.read === perFile &&
    a.rejected === result.rejections.length
  );
}

/**
 * Splits a string into pieces of 1 or 2 characters, alternating (a surrogate pair is one character:
 * text arrives as bytes, and {@link tinyByteChunks} cuts characters apart).
 */
export function tinyChunks(text: string): string[] {
  const chars = Array.from(text);
  const out: string[] = [];
  for (let i = 0, k = 0; i < chars.length; k++) {
    const n = k % 2 === 0 ? 1 : 2;
    out.push(chars.slice(i, i + n).join(''));
    i += n;
  }
  return out;
}

/** Splits bytes into pieces of 1 or 2 bytes, alternating, so multi-byte characters are cut apart. */
export function tinyByteChunks(bytes: Buffer): Buffer[] {
  const out: Buffer[] = [];
  for (let i = 0, k = 0; i < bytes.length; k++) {
    const n = k % 2 === 0 ? 1 : 2;
    out.push(bytes.subarray(i, i + n));
    i += n;
  }
  return out;
}
