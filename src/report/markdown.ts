import { SEVERITIES, type Finding, type FindingKind } from '../findings.js';
import type { AuditReport } from '../result.js';
import { DEFAULT_TOP, NOT_VERDICTS, formatCount, formatShare, sourceLabel, termLabel, truncate, type ReportOptions } from './common.js';

/**
 * `summary.md`: short enough for a pull-request comment. Counts, the gate's outcome, the trust
 * figure and the top findings; the rest is in report.html and report.json.
 *
 * Every string from the data is escaped: a backslash before each character that means something in
 * the middle of a line (CommonMark 0.31 §2.4 allows it before any ASCII punctuation): emphasis,
 * code spans, links, raw HTML and autolinks, table pipes, strikethrough, and `&` so that no entity
 * is decoded. Data never starts a line, so block markers (`#`, `-`, `+`) need no escape. Line breaks
 * fold to spaces so that a table row stays one row.
 */

const MARKDOWN_SPECIAL = /[\\`*_[\]<>|~&]/g;

export function escapeMarkdown(text: string): string {
  return text.replace(/\r\n|[\r\n\u2028\u2029]/g, ' ').replace(MARKDOWN_SPECIAL, (c) => `\\${c}`);
}

const KINDS: readonly FindingKind[] = ['syntax', 'violation', 'suspect'];

function cell(text: string, max: number): string {
  return escapeMarkdown(truncate(text, max));
}

function findingRow(f: Finding, index: number): string {
  const triple = f.subject === '' && f.predicate === '' && f.object === '' ? f.message : [f.subject, f.predicate, f.object].map(termLabel).join(' ');
  return `| ${index} | ${f.severity} | ${f.kind} | ${cell(f.check, 40)} | ${cell(triple, 160)} | ${formatShare(f.plausibility)} | ${cell(sourceLabel(f), 80)} |`;
}

/** Lays the report out as a Markdown summary. */
export function writeMarkdown(report: AuditReport, options: ReportOptions = {}): string {
  const top = options.top ?? DEFAULT_TOP;
  const { summary } = report;
  const lines: string[] = [];
  lines.push(`## plumb ${report.command}: ${formatCount(summary.findings)} finding${summary.findings === 1 ? '' : 's'}`, '');
  lines.push(`> ${NOT_VERDICTS}`, '');

  const counts = new Map<string, number>();
  for (const f of report.findings) counts.set(`${f.kind}/${f.severity}`, (counts.get(`${f.kind}/${f.severity}`) ?? 0) + 1);
  lines.push('| kind | error | warning | note | total |', '| --- | ---: | ---: | ---: | ---: |');
  for (const kind of KINDS) {
    const row = SEVERITIES.map((s) => counts.get(`${kind}/${s}`) ?? 0);
    lines.push(`| ${kind} | ${row.map(formatCount).join(' | ')} | ${formatCount(summary.byKind[kind])} |`);
  }
  lines.push(`| **total** | ${SEVERITIES.map((s) => formatCount(summary.bySeverity[s])).join(' | ')} | **${formatCount(summary.findings)}** |`, '');

  if (report.gate) {
    const g = report.gate;
    lines.push(g.passed ? '**Gate: passed.**' : '**Gate: failed.**');
    for (const crossed of g.crossed) lines.push(`- ${escapeMarkdown(crossed)}`);
    if (g.suppressed > 0 || g.expiredSuppressions > 0) {
      lines.push(`- ${formatCount(g.suppressed)} accepted by the suppressions file; ${formatCount(g.expiredSuppressions)} whose suppression expired came back`);
    }
    lines.push('');
  }

  const a = report.accounting;
  lines.push(
    `Read ${formatCount(a.read)} statements from ${report.inputs.length} input${report.inputs.length === 1 ? '' : 's'}: ` +
      `${formatCount(a.accepted)} accepted, ${formatCount(a.duplicates)} duplicates, ${formatCount(a.rejected)} rejected. ` +
      `${formatCount(summary.scored)} triples scored by the model.`,
    '',
  );
  const t = summary.trust;
  if (t) {
    lines.push(
      `Trust: average precision ${formatShare(t.averagePrecision)} against ${formatCount(t.injected)} planted errors ` +
        `(a random order scores about ${formatShare(t.baseline)}); precision among the top ${formatCount(t.injected)}: ${formatShare(t.precisionAtK)}. ` +
        escapeMarkdown(t.verdict),
      '',
    );
  }

  if (report.findings.length > 0 && top > 0) {
    const shown = report.findings.slice(0, top);
    lines.push(`### Top ${shown.length} finding${shown.length === 1 ? '' : 's'}`, '');
    lines.push('| # | severity | kind | check | triple | plausibility | source |', '| ---: | --- | --- | --- | --- | ---: | --- |');
    shown.forEach((f, i) => lines.push(findingRow(f, i + 1)));
    lines.push('');
    const rest = report.findings.length - shown.length;
    if (rest > 0) lines.push(`…and ${formatCount(rest)} more in report.html and report.json.`, '');
  }
  return `${lines.join('\n').replace(/\n+$/, '')}\n`;
}
