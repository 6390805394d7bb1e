import { describe, expect, it } from 'vitest';
import { escapeMarkdown, writeMarkdown } from '../../src/report/markdown.js';
import { finding, makeReport, manyFindings } from './make-report.js';

describe('summary.md', () => {
  it('gives counts, the trust figure, the gate and the top findings, and stays short', () => {
    const report = makeReport(manyFindings(5_000), {
      gate: { passed: false, crossed: ['250 errors > --max-errors 0'], thresholds: { maxErrors: 0 }, suppressed: 2, expiredSuppressions: 1 },
    });
    const md = writeMarkdown(report, { top: 10 });
    expect(md).toContain('## plumb audit: 5,000 findings');
    expect(md).toContain('candidates for review, not verdicts');
    expect(md).toContain('**Gate: failed.**');
    expect(md).toContain('- 250 errors \\> --max-errors 0');
    expect(md).toContain('### Top 10 findings');
    expect(md).toContain('…and 4,990 more');
    const rows = md.split('\n').filter((l) => /^\| \d+ \|/.test(l));
    expect(rows).toHaveLength(10);
    // A pull-request comment is limited to 65,536 characters (common practice: GitHub's limit).
    expect(md.length).toBeLessThan(8_000);
    const totals = md.split('\n').find((l) => l.startsWith('| **total**'))!;
    expect(totals).toContain(`| **${(5000).toLocaleString('en-US')}** |`);
  });

  it('escapes pipes, backticks and markup from the data so that a row stays one row and nothing renders as markup', () => {
    const nasty = 'a|b`c` <img src=x onerror=alert(1)> [link](javascript:alert(1)) **bold**\nsecond line';
    const report = makeReport([finding({ object: `"${nasty}"`, check: 'range|x', source: { file: 'data/a|b`.ttl', line: 2 } })]);
    const md = writeMarkdown(report);
    const row = md.split('\n').find((l) => l.startsWith('| 1 |'))!;
    // Unescaped pipes separate cells: exactly 8 for 7 columns.
    expect(row.match(/(?<!\\)\|/g)).toHaveLength(8);
    expect(row).not.toMatch(/(?<!\\)`/);
    expect(row).not.toMatch(/(?<!\\)</);
    expect(row).not.toMatch(/(?<!\\)\[/);
    expect(row).toContain('second line');
    expect(escapeMarkdown('x|y`z')).toBe('x\\|y\\`z');
  });

  it('cuts long terms and says it did', () => {
    const md = writeMarkdown(makeReport([finding({ object: `"${'x'.repeat(5_000_000)}"` })]));
    expect(md.length).toBeLessThan(3_000);
    expect(md).toMatch(/more characters/);
  });

  it('is byte-identical for the same report, and handles a report without findings', () => {
    expect(writeMarkdown(makeReport(manyFindings(30)))).toBe(writeMarkdown(makeReport(manyFindings(30))));
    const empty = writeMarkdown(makeReport([]));
    expect(empty).toContain('0 findings');
    expect(empty).not.toContain('### Top');
  });
});
