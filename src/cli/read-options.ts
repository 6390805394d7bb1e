import { isAbsolute, resolve } from 'node:path';
import type { Command } from 'commander';
import { parseFormatName, type ReadOptions } from '../sources/index.js';
import type { CliIO } from './io.js';

/**
 * The flags every command that reads a graph shares (`stats`, `check`, `audit`, `fit`, `gate`, …):
 * one definition here, so they read and mean the same everywhere. The input format is
 * `--input-format`, because `--format` names the report formats of the commands that write reports;
 * a command that writes none may also take `--format` for it (`{ format: true }`).
 */
export function addReadOptions(command: Command, options: { format?: boolean } = {}): Command {
  const formats = 'ntriples, nquads, turtle, trig, csv, tsv';
  command.option('--input-format <format>', `input format when the extension does not say: ${formats}`);
  if (options.format) command.option('--format <format>', 'the same as --input-format');
  return command
    .option(
      '--columns <columns>',
      'CSV/TSV: subject,predicate,object[,graph] by header name, or 0,1,2 by position',
    )
    .option(
      '--delimiter <char>',
      'CSV/TSV: cell delimiter (default , for CSV and a tab for TSV; \\t or tab for a tab)',
    )
    .option('--header', 'CSV/TSV: the first row is a header (default: recognised by its column names)')
    .option('--no-header', 'CSV/TSV: the first row is data')
    .option(
      '--base-iri <iri>',
      'IRI that bare CSV/TSV cells are placed under (default urn:plumb:); base for relative IRIs in Turtle/TriG',
    )
    .option('--strict', 'stop at the first malformed statement (exit 2) instead of skipping and listing it');
}

/** The reading flags as {@link ReadOptions}; standard input is the CLI's. Throws a usage error for an unknown format. */
export function toReadOptions(flags: Record<string, unknown>, io: CliIO): ReadOptions {
  const options: ReadOptions = { stdin: io.stdin };
  const format = typeof flags.inputFormat === 'string' ? flags.inputFormat : flags.format;
  if (typeof format === 'string') options.format = parseFormatName(format);
  if (typeof flags.columns === 'string') options.columns = flags.columns;
  if (typeof flags.delimiter === 'string') options.delimiter = flags.delimiter;
  if (typeof flags.header === 'boolean') options.header = flags.header;
  if (typeof flags.baseIri === 'string') options.baseIri = flags.baseIri;
  if (flags.strict === true) options.strict = true;
  return options;
}

/** Input paths as the user meant them: relative to the CLI's working directory (`-` stays standard input). */
export function inputPaths(files: readonly string[], io: CliIO): string[] {
  if (io.cwd === process.cwd()) return [...files];
  return files.map((f) => (f === '-' || isAbsolute(f) ? f : resolve(io.cwd, f)));
}
