import { readFile } from 'node:fs/promises';
import { Ajv, type ValidateFunction } from 'ajv';
import { lineColumn, parseJsonFile } from './config.js';
import { PlumbError } from './errors.js';
import type { Finding } from './findings.js';
import type { GateOutcome, SuppressedFinding } from './result.js';
import suppressionsSchema from '../schemas/suppressions.schema.json' with { type: 'json' };

/**
 * The merge gate's logic: which findings a suppressions file accepts, and whether what is left
 * crosses the thresholds. Pure functions of their arguments (the date comes in, it is not read);
 * `loadSuppressions` is the one that reads a file.
 */

/** One accepted finding: the triple and the check that raised it, why, and until when (inclusive, UTC). */
export interface Suppression {
  subject: string;
  predicate: string;
  object: string;
  check: string;
  reason: string;
  expires?: string;
}

export interface SuppressionResult {
  /** What the gate counts: unsuppressed findings, and those whose suppression expired (with a note). */
  active: Finding[];
  /** Accepted by a suppression in force; kept for the reports (SARIF suppressions), not counted. */
  suppressed: SuppressedFinding[];
  /** The findings that came back because their suppression expired; each is also in `active`. */
  expired: SuppressedFinding[];
  /** Entries that matched no finding: candidates for removal from the file. */
  unused: Suppression[];
}

export interface GateThresholds {
  /** Most findings of severity `error` allowed. */
  maxErrors?: number;
  /** Most findings of severity `warning` allowed. */
  maxWarnings?: number;
  /** Most suspects (findings of kind `suspect`) allowed. */
  maxSuspects?: number;
  /** Every scored finding must be at least this plausible. */
  minPlausibility?: number;
}

/** What `plumb gate` uses when no threshold is given: any error fails. */
export const DEFAULT_GATE_THRESHOLDS: Readonly<GateThresholds> = { maxErrors: 0 };

/** `<http://x>` and `http://x` name the same IRI; literals and blank nodes are compared as written. */
export function normaliseTerm(term: string): string {
  const t = term.trim();
  return t.length >= 2 && t.startsWith('<') && t.endsWith('>') ? t.slice(1, -1) : t;
}

function matchKey(check: string, s: string, p: string, o: string): string {
  return `${check}\u0000${s}\u0000${p}\u0000${o}`;
}

/** YYYY-MM-DD of `date` in UTC. */
export function utcDay(date: Date): string {
  return date.toISOString().slice(0, 10);
}

/** True when the suppression no longer holds on `today`: it holds through its expiry day, UTC. */
export function isExpired(suppression: Suppression, today: Date): boolean {
  return suppression.expires !== undefined && utcDay(today) > suppression.expires;
}

/**
 * Splits findings into those the gate counts and those the suppressions accept. A suppression
 * matches a finding with the same check and the same subject, predicate and object. An expired
 * suppression suppresses nothing: its finding comes back, its message noting the expiry and its
 * evidence holding `suppression: { expired, reason }`.
 */
export function applySuppressions(findings: readonly Finding[], suppressions: readonly Suppression[], today: Date): SuppressionResult {
  const byKey = new Map<string, Suppression[]>();
  for (const s of suppressions) {
    const key = matchKey(s.check, normaliseTerm(s.subject), normaliseTerm(s.predicate), normaliseTerm(s.object));
    const list = byKey.get(key);
    if (list) list.push(s);
    else byKey.set(key, [s]);
  }
  const used = new Set<Suppression>();
  const result: SuppressionResult = { active: [], suppressed: [], expired: [], unused: [] };
  for (const finding of findings) {
    const candidates = byKey.get(matchKey(finding.check, finding.subject, finding.predicate, finding.object));
    if (!candidates) {
      result.active.push(finding);
      continue;
    }
    for (const c of candidates) used.add(c);
    const inForce = candidates.find((c) => !isExpired(c, today));
    if (inForce) {
      result.suppressed.push({ finding, suppression: describe(inForce) });
      continue;
    }
    // The latest expiry is the one a reader will look for in the file.
    const latest = candidates.reduce((a, b) => ((b.expires ?? '') > (a.expires ?? '') ? b : a));
    const back: Finding = {
      ...finding,
      message: `${finding.message} (its suppression expired on ${latest.expires}: ${latest.reason})`,
      evidence: { ...finding.evidence, suppression: { expired: latest.expires, reason: latest.reason } },
    };
    result.active.push(back);
    result.expired.push({ finding: back, suppression: describe(latest) });
  }
  result.unused = suppressions.filter((s) => !used.has(s));
  return result;
}

function describe(s: Suppression): { reason: string; expires?: string } {
  return s.expires === undefined ? { reason: s.reason } : { reason: s.reason, expires: s.expires };
}

function checkThresholds(t: GateThresholds): void {
  for (const key of ['maxErrors', 'maxWarnings', 'maxSuspects'] as const) {
    const v = t[key];
    if (v !== undefined && (!Number.isInteger(v) || v < 0)) {
      const flag = `--${key.replace(/[A-Z]/g, (c) => `-${c.toLowerCase()}`)}`;
      throw new PlumbError('E_USAGE', `${flag} must be a whole number ≥ 0, not ${v}`, { hint: `for example ${flag} 0` });
    }
  }
  const p = t.minPlausibility;
  if (p !== undefined && !(p >= 0 && p <= 1)) {
    throw new PlumbError('E_USAGE', `--min-plausibility must be between 0 and 1, not ${p}`, { hint: 'for example --min-plausibility 0.05' });
  }
}

const plural = (n: number, word: string): string => `${n} ${word}${n === 1 ? '' : 's'}`;

/**
 * Whether the findings the gate counts stay within the thresholds. Only the thresholds given are
 * checked (merge `DEFAULT_GATE_THRESHOLDS` first for the CLI's defaults). Each threshold crossed
 * gives one line, `3 errors > --max-errors 0`.
 */
export function evaluateGate(
  findings: readonly Finding[],
  thresholds: GateThresholds,
  counts: { suppressed?: number; expiredSuppressions?: number } = {},
): GateOutcome {
  checkThresholds(thresholds);
  let errors = 0;
  let warnings = 0;
  let suspects = 0;
  let below = 0;
  let lowest = Infinity;
  for (const f of findings) {
    if (f.severity === 'error') errors++;
    else if (f.severity === 'warning') warnings++;
    if (f.kind === 'suspect') suspects++;
    if (thresholds.minPlausibility !== undefined && f.plausibility !== undefined && f.plausibility < thresholds.minPlausibility) {
      below++;
      lowest = Math.min(lowest, f.plausibility);
    }
  }
  const crossed: string[] = [];
  const record: Record<string, number> = {};
  if (thresholds.maxErrors !== undefined) {
    record.maxErrors = thresholds.maxErrors;
    if (errors > thresholds.maxErrors) crossed.push(`${plural(errors, 'error')} > --max-errors ${thresholds.maxErrors}`);
  }
  if (thresholds.maxWarnings !== undefined) {
    record.maxWarnings = thresholds.maxWarnings;
    if (warnings > thresholds.maxWarnings) crossed.push(`${plural(warnings, 'warning')} > --max-warnings ${thresholds.maxWarnings}`);
  }
  if (thresholds.maxSuspects !== undefined) {
    record.maxSuspects = thresholds.maxSuspects;
    if (suspects > thresholds.maxSuspects) crossed.push(`${plural(suspects, 'suspect')} > --max-suspects ${thresholds.maxSuspects}`);
  }
  if (thresholds.minPlausibility !== undefined) {
    record.minPlausibility = thresholds.minPlausibility;
    if (below > 0) crossed.push(`${plural(below, 'triple')} below --min-plausibility ${thresholds.minPlausibility} (lowest ${lowest.toFixed(3)})`);
  }
  return {
    passed: crossed.length === 0,
    crossed,
    thresholds: record,
    suppressed: counts.suppressed ?? 0,
    expiredSuppressions: counts.expiredSuppressions ?? 0,
  };
}

/**
 * The whole decision `plumb gate` makes on the incoming findings: suppressions first, then the
 * thresholds (with `DEFAULT_GATE_THRESHOLDS` under those given), then the exit code.
 */
export function decideGate(
  findings: readonly Finding[],
  suppressions: readonly Suppression[],
  thresholds: GateThresholds,
  today: Date,
): SuppressionResult & { outcome: GateOutcome; exitCode: 0 | 1 } {
  const split = applySuppressions(findings, suppressions, today);
  const outcome = evaluateGate(split.active, { ...DEFAULT_GATE_THRESHOLDS, ...definedOnly(thresholds) }, {
    suppressed: split.suppressed.length,
    expiredSuppressions: split.expired.length,
  });
  return { ...split, outcome, exitCode: gateExitCode(outcome) };
}

function definedOnly(t: GateThresholds): GateThresholds {
  return Object.fromEntries(Object.entries(t).filter(([, v]) => v !== undefined)) as GateThresholds;
}

/** 0 when the gate passed, 1 when a threshold was crossed (DESIGN.md's exit codes). */
export function gateExitCode(outcome: GateOutcome): 0 | 1 {
  return outcome.passed ? 0 : 1;
}

let validator: ValidateFunction | undefined;

/** Offsets of the top-level array's items in JSON text (strings skipped), to point at an entry's line. */
function itemOffsets(text: string): number[] {
  const offsets: number[] = [];
  let depth = 0;
  let expectItem = false;
  for (let i = 0; i < text.length; i++) {
    const c = text[i]!;
    if (c === '"') {
      if (depth === 1 && expectItem) offsets.push(i);
      expectItem = false;
      for (i++; i < text.length && text[i] !== '"'; i++) if (text[i] === '\\') i++;
      continue;
    }
    if (c === '[' || c === '{') {
      if (depth === 1 && expectItem) offsets.push(i);
      expectItem = false;
      depth++;
      if (depth === 1 && c === '[') expectItem = true;
      continue;
    }
    if (c === ']' || c === '}') {
      depth--;
      continue;
    }
    if (c === ',' && depth === 1) {
      expectItem = true;
      continue;
    }
    if (depth === 1 && expectItem && !' \t\r\n'.includes(c)) {
      offsets.push(i);
      expectItem = false;
    }
  }
  return offsets;
}

function validDate(day: string): boolean {
  const d = new Date(`${day}T00:00:00Z`);
  return !Number.isNaN(d.getTime()) && utcDay(d) === day;
}

/**
 * Reads a suppressions file: a JSON list of `{ subject, predicate, object, check, reason, expires? }`
 * (schemas/suppressions.schema.json). A missing file, bad JSON or a bad entry is a PlumbError
 * naming the file and the line of the entry.
 */
export async function loadSuppressions(path: string): Promise<Suppression[]> {
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch (error) {
    throw new PlumbError('E_INPUT', `cannot read the suppressions file ${path}: ${(error as NodeJS.ErrnoException).code === 'ENOENT' ? 'no such file' : (error as Error).message}`, {
      position: { file: path },
      hint: 'check the path given with --suppressions (or "suppressions" in plumb.config.json)',
      cause: error,
    });
  }
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  const value = parseJsonFile(text, path, 'E_INPUT');
  if (!validator) validator = new Ajv({ allErrors: true, strict: true }).compile(suppressionsSchema);
  const entryLine = (index: number): number | undefined => {
    const offset = itemOffsets(text)[index];
    return offset === undefined ? undefined : lineColumn(text, offset).line;
  };
  if (!validator(value)) {
    const e = (validator.errors ?? [])[0];
    const parts = (e?.instancePath ?? '').split('/').filter(Boolean);
    if (parts.length === 0) {
      throw new PlumbError('E_INPUT', `${path} must hold a JSON list of suppressions`, {
        position: { file: path, line: 1 },
        hint: 'write [{"subject": "…", "predicate": "…", "object": "…", "check": "…", "reason": "…", "expires": "YYYY-MM-DD"}]',
      });
    }
    const index = Number(parts[0]);
    const line = entryLine(index);
    let what: string;
    if (e?.keyword === 'required') what = `lacks "${(e.params as { missingProperty: string }).missingProperty}"`;
    else if (e?.keyword === 'additionalProperties') what = `has an unknown key "${(e.params as { additionalProperty: string }).additionalProperty}"`;
    else if (parts[1] === 'expires') what = 'has "expires" that is not a date written YYYY-MM-DD';
    else what = `has "${parts[1] ?? ''}" ${e?.message ?? 'that is invalid'}`;
    throw new PlumbError('E_INPUT', `${path}: suppression ${index + 1} ${what}`, {
      position: line === undefined ? { file: path } : { file: path, line },
      hint: 'each suppression needs subject, predicate, object, check and reason; expires is optional',
    });
  }
  const list = value as Suppression[];
  list.forEach((s, index) => {
    if (s.expires !== undefined && !validDate(s.expires)) {
      const line = entryLine(index);
      throw new PlumbError('E_INPUT', `${path}: suppression ${index + 1} expires on ${s.expires}, which is not a date`, {
        position: line === undefined ? { file: path } : { file: path, line },
        hint: 'write the last day the suppression holds as YYYY-MM-DD',
      });
    }
  });
  return list;
}

export { suppressionsSchema };
