import { Readable } from 'node:stream';
import { describe, expect, it } from 'vitest';
import type { CliIO } from '../../src/cli/io.js';
import { createProgressSink, formatTerminalSummary } from '../../src/report/terminal.js';
import { finding, makeReport, manyFindings } from './make-report.js';

const ESC = '\u001b[';

function io(options: { tty: boolean; env?: Record<string, string> }): CliIO & { err: () => string } {
  let err = '';
  return {
    stdout: { write: () => true },
    stderr: { write: (s: string) => ((err += s), true), isTTY: options.tty },
    stdin: Readable.from([]),
    env: { ...options.env },
    cwd: process.cwd(),
    err: () => err,
  };
}

describe('terminal summary', () => {
  const report = makeReport(manyFindings(40), { gate: { passed: false, crossed: ['4 errors > --max-errors 0'], thresholds: { maxErrors: 0 }, suppressed: 0, expiredSuppressions: 0 } });

  it('is plain text without colour when colour is off, with counts, trust, top findings and the gate', () => {
    const text = formatTerminalSummary(report, { color: false, top: 5 });
    expect(text).not.toContain(ESC);
    expect(text).toContain('40 findings');
    expect(text).toContain('average precision 0.410');
    expect(text).toContain('top 5:');
    expect(text).toContain('gate: FAILED');
    expect(text).toContain('4 errors > --max-errors 0');
    expect(text).toContain('not verdicts');
    expect(text).toContain('… 35 more');
  });

  it('says one finding and one error in the singular', () => {
    const one = manyFindings(1).map((f) => ({ ...f, severity: 'error' as const }));
    const text = formatTerminalSummary(makeReport(one), { color: false });
    expect(text).toContain('1 finding:');
    expect(text).toContain('1 error,');
    expect(text).not.toMatch(/\b1 (findings|errors)\b/);
  });

  it('colours only when asked', () => {
    expect(formatTerminalSummary(report, { color: true })).toContain(ESC);
  });

  it('never passes control characters from the data to the terminal', () => {
    const hostile = makeReport([finding({ object: '"\u001b[2J\u001b]0;pwned\u0007"', check: 'range\u001b[31m', message: 'x\r\ny' })]);
    const text = formatTerminalSummary(hostile, { color: false });
    expect(text).not.toMatch(/[\u0000-\u0009\u000b-\u001f]/);
  });
});

describe('progress bars', () => {
  it('draw on an interactive stderr', async () => {
    const target = io({ tty: true });
    const { sink, stop } = createProgressSink(target);
    sink({ phase: 'fit', done: 0, total: 10 });
    sink({ phase: 'fit', done: 5, total: 10, detail: 'epoch 5 loss 0.41' });
    sink({ phase: 'score', done: 3 });
    await new Promise((r) => setTimeout(r, 150));
    stop();
    expect(target.err()).toContain('fit');
    expect(target.err()).toContain('score');
  });

  it('stay silent when stderr is not a terminal, or NO_COLOR or CI is set', async () => {
    for (const target of [io({ tty: false }), io({ tty: true, env: { NO_COLOR: '1' } }), io({ tty: true, env: { CI: 'true' } })]) {
      const { sink, stop } = createProgressSink(target);
      sink({ phase: 'fit', done: 1, total: 10 });
      await new Promise((r) => setTimeout(r, 30));
      stop();
      expect(target.err()).toBe('');
    }
  });
});
