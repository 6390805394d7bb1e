import { atLeast, severityRank, type Finding, type Severity } from '../findings.js';
import type { AuditReport } from '../result.js';
import { checksOf, compareText, sourceLabel, termLabel, tripleLabel, truncate, type ReportOptions } from './common.js';

/**
 * `junit.xml`: the findings as test results for CI systems that show them. The layout is the
 * common one (`testsuites` > `testsuite` > `testcase` > `failure`; no standard body defines it, so
 * it follows common practice): one suite of test cases per check, one per predicate; a case fails
 * when it has a finding at or above the failing severity (`failOn`, default `error`).
 */

/** Findings listed inside one failure; the rest are counted. */
const LISTED = 20;

/**
 * Characters XML 1.0 does not allow anywhere (W3C XML 1.0 §2.2, production [2] Char), lone
 * surrogates included: they are dropped rather than escaped, since no escape makes them legal.
 */
const ILLEGAL_XML = /[^\t\n\r\u0020-\uD7FF\uE000-\uFFFD\u{10000}-\u{10FFFF}]/gu;

export function xmlText(text: string): string {
  return text.replace(ILLEGAL_XML, '').replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');
}

/** Attribute values: also quotes, and line breaks kept as character references so parsers do not fold them. */
export function xmlAttr(text: string): string {
  return xmlText(text).replace(/"/g, '&quot;').replace(/'/g, '&apos;').replace(/\t/g, '&#9;').replace(/\n/g, '&#10;').replace(/\r/g, '&#13;');
}

interface Case {
  classname: string;
  name: string;
  findings: Finding[];
}

function failingOf(c: Case, failOn: Severity): Finding[] {
  return c.findings.filter((f) => atLeast(f.severity, failOn));
}

function caseXml(c: Case, failOn: Severity): string {
  const open = `    <testcase classname="${xmlAttr(c.classname)}" name="${xmlAttr(c.name)}" time="0"`;
  const failing = failingOf(c, failOn);
  if (failing.length === 0) return `${open}/>`;
  const gravest = failing.reduce((a, f) => (severityRank(f.severity) < severityRank(a.severity) ? f : a)).severity;
  const lines = failing.slice(0, LISTED).map((f) => {
    const where = sourceLabel(f);
    const triple = tripleLabel(f, 300);
    return `${f.severity} ${f.kind} [${f.check}]${where ? ` ${where}` : ''}: ${truncate(f.message, 1000)}${triple ? `\n  ${triple}` : ''}`;
  });
  if (failing.length > LISTED) lines.push(`… and ${failing.length - LISTED} more (see report.json)`);
  const message = `${failing.length} finding${failing.length === 1 ? '' : 's'} at or above ${failOn}`;
  return `${open}>\n      <failure message="${xmlAttr(message)}" type="${gravest}">${xmlText(lines.join('\n'))}</failure>\n    </testcase>`;
}

function suiteXml(name: string, cases: Case[], failOn: Severity, timestamp: string, time: number): string {
  const failures = cases.filter((c) => failingOf(c, failOn).length > 0).length;
  const head = `  <testsuite name="${xmlAttr(name)}" tests="${cases.length}" failures="${failures}" errors="0" skipped="0" time="${time}" timestamp="${xmlAttr(timestamp)}"`;
  if (cases.length === 0) return `${head}/>`;
  return `${head}>\n${cases.map((c) => caseXml(c, failOn)).join('\n')}\n  </testsuite>`;
}

/** Lays the report out as JUnit XML. */
export function writeJunit(report: AuditReport, options: ReportOptions = {}): string {
  const failOn = options.failOn ?? 'error';
  const byCheck = new Map<string, Finding[]>();
  const byPredicate = new Map<string, Finding[]>();
  for (const row of report.predicates) byPredicate.set(row.predicate, []);
  for (const f of report.findings) {
    let list = byCheck.get(f.check);
    if (!list) byCheck.set(f.check, (list = []));
    list.push(f);
    if (f.predicate !== '') {
      let plist = byPredicate.get(f.predicate);
      if (!plist) byPredicate.set(f.predicate, (plist = []));
      plist.push(f);
    }
  }
  const checkCases: Case[] = checksOf(report).map((c) => ({ classname: 'plumb.check', name: c.id, findings: byCheck.get(c.id) ?? [] }));
  const predicateCases: Case[] = [...byPredicate.keys()]
    .sort(compareText)
    .map((p) => ({ classname: 'plumb.predicate', name: termLabel(p), findings: byPredicate.get(p) ?? [] }));
  const timestamp = report.createdAt.replace(/\.\d+Z$|Z$/, '');
  const round = (x: number): number => (Number.isFinite(x) ? Math.round(x * 1000) / 1000 : 0);
  const total = round(Object.values(report.durations).reduce((a, b) => a + b, 0));
  const suites = [
    suiteXml('plumb checks', checkCases, failOn, timestamp, round((report.durations.checks ?? 0) + (report.durations.score ?? 0))),
    suiteXml('plumb predicates', predicateCases, failOn, timestamp, 0),
  ];
  const tests = checkCases.length + predicateCases.length;
  const failures = [...checkCases, ...predicateCases].filter((c) => failingOf(c, failOn).length > 0).length;
  return (
    '<?xml version="1.0" encoding="UTF-8"?>\n' +
    `<testsuites name="plumb ${xmlAttr(report.command)}" tests="${tests}" failures="${failures}" errors="0" time="${total}">\n` +
    `${suites.join('\n')}\n</testsuites>\n`
  );
}
