import { resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { usageError } from '../errors.js';
import { GraphBuilder, type Graph } from '../graph/store.js';
import type { ProgressSink } from '../progress.js';
import type { Accounting, InputInfo } from '../result.js';
import { DEFAULT_BASE_IRI, readCsv } from './csv.js';
import { resolveFormat, type InputFormat } from './format.js';
import { openInput } from './input.js';
import { readRdf } from './rdf.js';
import { FileSink, type Rejection } from './sink.js';
import { textBatches, type TextBatch } from './text.js';

/**
 * Sources: bytes to terms. Every statement read ends up accepted, a duplicate or rejected with its
 * file, line, column and reason, so `read = accepted + duplicates + rejected` holds exactly.
 * See `rdf.ts` (recovery after syntax errors), `csv.ts` (cells to terms) and `text.ts` (encodings,
 * line breaks, bad bytes) for the rules of each layer.
 */

export type { InputFormat } from './format.js';
export { INPUT_FORMATS, formatFromPath, parseFormatName } from './format.js';
export { MAX_REJECTIONS, type Rejection } from './sink.js';
export { DEFAULT_BASE_IRI } from './csv.js';

export interface ReadOptions {
  /** Else by extension: .nt .nq .ttl .trig .csv .tsv (.txt and .tab are TSV), each optionally .gz. */
  format?: InputFormat;
  /** CSV/TSV: `subject,predicate,object[,graph]` by header name, or `0,1,2` by position. */
  columns?: string;
  /** CSV/TSV: the cell delimiter (default `,` for CSV, tab for TSV; `\t` and `tab` mean a tab). */
  delimiter?: string;
  /** CSV/TSV: whether the first row is a header (default: recognised by its role names). */
  header?: boolean;
  /** CSV/TSV: the IRI bare cells are placed under (default `urn:plumb:`); Turtle/TriG: the base for relative IRIs (default the file's URL). */
  baseIri?: string;
  /** Stop at the first malformed statement with a PlumbError (exit 2) giving file:line:column. */
  strict?: boolean;
  /** Read for the path `-` (default `process.stdin`). */
  stdin?: NodeJS.ReadableStream;
  progress?: ProgressSink;
  /** Read into an existing builder: several calls merge into one graph (e.g. a base, then the incoming triples). */
  builder?: GraphBuilder;
}

export interface ReadResult {
  graph: Graph;
  accounting: Accounting;
  /** Every rejected statement in reading order, up to {@link MAX_REJECTIONS} (`accounting.rejected` counts all). */
  rejections: Rejection[];
  inputs: InputInfo[];
}

/** Reads the files into one graph and builds its indexes. */
export async function readGraph(paths: readonly string[], options: ReadOptions = {}): Promise<ReadResult> {
  const builder = options.builder ?? new GraphBuilder();
  const read = await readInto(builder, paths, options);
  return { graph: builder.build(), ...read };
}

/**
 * Reads the files into `builder` without building, so that several reads can merge first. Each file
 * is registered with `builder.addFile`, so `graph.provenance` tells which file and line each triple
 * came from; blank nodes are distinct per file. The counts are those of this call only.
 */
export async function readInto(
  builder: GraphBuilder,
  paths: readonly string[],
  options: ReadOptions = {},
): Promise<Omit<ReadResult, 'graph'>> {
  if (paths.length === 0)
    throw usageError('no input files given', 'name one or more graph files, or `-` for standard input');
  if (paths.filter((p) => p === '-').length > 1)
    throw usageError('standard input (`-`) can be read only once');
  // Decide every format before reading anything, so a bad name fails fast.
  const formats = paths.map((path) => resolveFormat(path, options.format));
  const strict = options.strict ?? false;
  const rejections: Rejection[] = [];
  const inputs: InputInfo[] = [];
  const accounting: Accounting = { read: 0, accepted: 0, duplicates: 0, rejected: 0 };
  const progress = options.progress;
  let bytesBefore = 0;

  for (let i = 0; i < paths.length; i++) {
    const path = paths[i]!;
    const format = formats[i]!;
    const input = await openInput(path, options.stdin);
    const sink = new FileSink(builder, path, strict, rejections);
    let batches: AsyncIterable<TextBatch> = textBatches(input.chunks, { file: path, strict });
    if (progress !== undefined) {
      const before = bytesBefore;
      batches = reportProgress(batches, () => {
        progress({
          phase: 'read',
          done: before + input.bytes,
          ...(input.size === undefined ? {} : { total: before + input.size }),
          detail: path,
        });
      });
    }
    if (format === 'csv' || format === 'tsv') {
      await readCsv(batches, {
        sink,
        format,
        columns: options.columns,
        delimiter: options.delimiter,
        header: options.header,
        baseIri: options.baseIri ?? DEFAULT_BASE_IRI,
      });
    } else {
      const baseIri = options.baseIri ?? (path === '-' ? undefined : pathToFileURL(resolve(path)).href);
      await readRdf(batches, { sink, format, baseIri });
    }
    bytesBefore += input.bytes;
    inputs.push({ path, format, bytes: input.bytes, sha256: input.sha256(), statements: sink.statements });
    accounting.read += sink.statements;
    accounting.accepted += sink.accepted;
    accounting.duplicates += sink.duplicates;
    accounting.rejected += sink.rejected;
  }
  return { accounting, rejections, inputs };
}

async function* reportProgress(
  batches: AsyncIterable<TextBatch>,
  report: () => void,
): AsyncGenerator<TextBatch> {
  for await (const batch of batches) {
    yield batch;
    report();
  }
}
