import type { Finding, Severity } from '../findings.js';
import type { AuditReport, CheckInfo } from '../result.js';

/**
 * Small pieces every writer shares. Writers are pure functions of the report: nothing here reads a
 * clock, the environment or the disk, so the same report always lays out to the same bytes.
 */

/** Options a writer may take; each ignores what does not concern it. */
export interface ReportOptions {
  /** How many findings the short summaries (terminal, Markdown) list. */
  top?: number;
  /** JUnit: a test case fails when it has a finding at or above this severity. */
  failOn?: Severity;
}

export const DEFAULT_TOP = 10;

/** Cuts `text` to at most `max` characters (whole code points), saying how much was left out. */
export function truncate(text: string, max: number): string {
  if (text.length <= max) return text;
  let cut = max;
  // Never split a surrogate pair: a lone half is not valid in XML nor printable.
  const code = text.charCodeAt(cut - 1);
  if (code >= 0xd800 && code <= 0xdbff) cut -= 1;
  return `${text.slice(0, cut)}… (${text.length - cut} more characters)`;
}

/** The N-Triples-like label of a term key for text output: IRIs in angle brackets. */
export function termLabel(key: string): string {
  if (key === '') return '';
  const c = key.charCodeAt(0);
  if (c === 34 /* " */ || key.startsWith('_:')) return key;
  return `<${key}>`;
}

/** `s p o` for one finding, each term cut to `max` characters. */
export function tripleLabel(finding: Finding, max = 200): string {
  if (finding.subject === '' && finding.predicate === '' && finding.object === '') return '';
  return [finding.subject, finding.predicate, finding.object].map((t) => truncate(termLabel(t), max)).join(' ');
}

/** `file:line[:column]`, or '' when the finding has no source. */
export function sourceLabel(finding: Finding): string {
  const s = finding.source;
  if (!s) return '';
  return s.column === undefined ? `${s.file}:${s.line}` : `${s.file}:${s.line}:${s.column}`;
}

/** A title for check ids the report did not describe. */
function fallbackTitle(id: string): string {
  return id === 'model' ? 'The relational model finds the triple implausible' : `Check ${id}`;
}

/**
 * The checks to lay out: those the report says ran, plus any id that appears only in findings
 * (older reports, or a pipeline that did not list its checks), sorted by id.
 */
export function checksOf(report: AuditReport): CheckInfo[] {
  const byId = new Map<string, CheckInfo>();
  for (const c of report.checks ?? []) if (!byId.has(c.id)) byId.set(c.id, c);
  const all = [...report.findings, ...(report.suppressed ?? []).map((s) => s.finding)];
  for (const f of all) {
    if (!byId.has(f.check)) byId.set(f.check, { id: f.check, title: fallbackTitle(f.check), severity: f.severity });
  }
  return [...byId.values()].sort((a, b) => compareText(a.id, b.id));
}

/** Code-unit order: the same on every machine and locale, unlike `localeCompare`. */
export function compareText(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}

/** Formats a share in [0, 1] with three decimals; '–' when absent. */
export function formatShare(value: number | undefined): string {
  return value === undefined ? '–' : value.toFixed(3);
}

/** Formats a count with comma grouping that does not depend on the locale: 12,345. */
export function formatCount(value: number): string {
  return String(value).replace(/\B(?=(\d{3})+(?!\d))/g, ',');
}

/** A grouped count and its noun, singular for exactly one: "1 error", "12,345 errors". */
export function countOf(value: number, one: string, many = `${one}s`): string {
  return `${formatCount(value)} ${value === 1 ? one : many}`;
}

export const NOT_VERDICTS_HEAD = 'Findings are candidates for review, not verdicts.';
export const NOT_VERDICTS_TAIL = 'Removing data on the model’s word alone can remove true facts: check each one against a source first.';
export const NOT_VERDICTS = `${NOT_VERDICTS_HEAD} ${NOT_VERDICTS_TAIL}`;
