import { Chalk, type ChalkInstance } from 'chalk';
import cliProgress from 'cli-progress';
import type { Severity } from '../findings.js';
import { isInteractive, type CliIO } from '../cli/io.js';
import type { ProgressEvent, ProgressSink } from '../progress.js';
import type { AuditReport } from '../result.js';
import { DEFAULT_TOP, NOT_VERDICTS, countOf, formatCount, formatShare, sourceLabel, tripleLabel, truncate, type ReportOptions } from './common.js';

/**
 * What a person sees on the terminal: a compact summary (colour only when the caller asks, which
 * the CLI does only on an interactive stderr) and progress bars on stderr for long steps.
 */

export interface TerminalOptions extends ReportOptions {
  color: boolean;
  /** Columns to fit the finding lines into; 100 when unknown. */
  width?: number;
}

/** Control characters from the data would move the cursor or recolour the terminal: shown as spaces. */
function plain(text: string): string {
  return text.replace(/[\u0000-\u001f\u007f-\u009f\u2028\u2029]/g, ' ');
}

function paintSeverity(c: ChalkInstance, severity: Severity, text: string): string {
  if (severity === 'error') return c.red.bold(text);
  if (severity === 'warning') return c.yellow(text);
  return c.cyan(text);
}

/** The summary printed at the end of a run: counts, gate, trust, the top findings and the reminder. */
export function formatTerminalSummary(report: AuditReport, options: TerminalOptions): string {
  const c = new Chalk({ level: options.color ? 1 : 0 });
  const width = Math.max(40, options.width ?? 100);
  const top = options.top ?? DEFAULT_TOP;
  const { summary, accounting: a } = report;
  const out: string[] = [];
  out.push(
    `${c.bold(`plumb ${report.command}`)}  ${countOf(report.inputs.length, 'input')}, ` +
      `${countOf(a.read, 'statement')} read (${formatCount(a.accepted)} accepted, ${countOf(a.duplicates, 'duplicate')}, ${formatCount(a.rejected)} rejected)`,
  );
  const sev = summary.bySeverity;
  out.push(
    `${c.bold(countOf(summary.findings, 'finding'))}: ` +
      `${paintSeverity(c, 'error', countOf(sev.error, 'error'))}, ${paintSeverity(c, 'warning', countOf(sev.warning, 'warning'))}, ` +
      `${paintSeverity(c, 'note', countOf(sev.note, 'note'))}  ·  ${countOf(summary.byKind.violation, 'violation')}, ` +
      `${countOf(summary.byKind.suspect, 'suspect')}, ${formatCount(summary.byKind.syntax)} syntax`,
  );
  if (summary.scored > 0) out.push(`${countOf(summary.scored, 'triple')} scored by the model`);
  const t = summary.trust;
  if (t) {
    out.push(
      `trust: average precision ${formatShare(t.averagePrecision)} vs ${formatShare(t.baseline)} for a random order, ` +
        `precision@${formatCount(t.injected)} ${formatShare(t.precisionAtK)}`,
    );
    out.push(c.dim(`  ${plain(truncate(t.verdict, 300))}`));
  }
  const shown = report.findings.slice(0, Math.max(0, top));
  if (shown.length > 0) {
    out.push(c.bold(`top ${shown.length}:`));
    const pad = String(shown.length).length;
    for (const [i, f] of shown.entries()) {
      const where = plain(truncate(sourceLabel(f), 120));
      const plaus = f.plausibility === undefined ? '' : ` p=${formatShare(f.plausibility)}`;
      const body = tripleLabel(f, 80) || f.message;
      const num = String(i + 1).padStart(pad);
      out.push(`  ${num} ${paintSeverity(c, f.severity, f.severity.padEnd(7))} ${plain(truncate(f.check, 40))}${plaus}${where ? `  ${where}` : ''}`);
      out.push(`  ${' '.repeat(pad + 1)}${plain(truncate(body, Math.max(20, width - pad - 5)))}`);
    }
    if (report.findings.length > shown.length) out.push(c.dim(`  … ${formatCount(report.findings.length - shown.length)} more in the reports`));
  }
  if (report.suppressed && report.suppressed.length > 0) out.push(`${formatCount(report.suppressed.length)} accepted by the suppressions file`);
  if (report.gate) {
    out.push(report.gate.passed ? c.green.bold('gate: passed') : c.red.bold('gate: FAILED'));
    for (const line of report.gate.crossed) out.push(`  ${plain(line)}`);
  }
  out.push(c.dim(NOT_VERDICTS));
  return `${out.join('\n')}\n`;
}

/**
 * Progress bars on stderr, one per phase, only when stderr is an interactive terminal without
 * NO_COLOR or CI; otherwise a sink that drops every event. Call `stop()` before printing anything
 * else to stderr.
 */
export function createProgressSink(io: CliIO): { sink: ProgressSink; stop(): void } {
  if (!isInteractive(io)) return { sink: () => {}, stop: () => {} };
  const multi = new cliProgress.MultiBar(
    {
      stream: io.stderr as unknown as NodeJS.WritableStream,
      format: '{phase} [{bar}] {percentage}% {value}/{total} {detail}',
      barsize: 24,
      hideCursor: true,
      clearOnComplete: false,
      fps: 10,
      autopadding: true,
    },
    cliProgress.Presets.shades_classic,
  );
  const bars = new Map<string, cliProgress.SingleBar>();
  let stopped = false;
  const sink: ProgressSink = (event: ProgressEvent) => {
    if (stopped) return;
    const detail = event.detail === undefined ? '' : truncate(event.detail, 60);
    let bar = bars.get(event.phase);
    const phase = event.phase.padEnd(9);
    if (!bar) {
      const format = event.total === undefined ? '{phase} {value} {detail}' : undefined;
      bar = multi.create(event.total ?? 0, event.done, { phase, detail }, format === undefined ? {} : { format });
      bars.set(event.phase, bar);
      return;
    }
    if (event.total !== undefined) bar.setTotal(event.total);
    bar.update(event.done, { phase, detail });
  };
  return {
    sink,
    stop() {
      if (stopped) return;
      stopped = true;
      multi.stop();
    },
  };
}
