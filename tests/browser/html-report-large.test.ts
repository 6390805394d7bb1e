import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { BrowserContext } from 'playwright-core';
import { writeHtml } from '../../src/report/html.js';
import { makeReport, manyFindings } from '../report/make-report.js';
import { SKIP_MESSAGE, chromiumAvailable, launch, openReport } from './chromium.js';

if (!chromiumAvailable) console.warn(SKIP_MESSAGE);

/**
 * 100,000 findings stay responsive: the page renders one page of rows, and filtering, searching,
 * sorting and paging answer within a few seconds. The limits here are generous on purpose (the
 * test machines are shared); tests/bench/report.ts measures the real figures.
 */
describe.skipIf(!chromiumAvailable)('report.html with 100,000 findings', () => {
  let context: BrowserContext;
  let dir: string;
  beforeAll(async () => {
    ({ context, dir } = await launch());
  });
  afterAll(async () => {
    await context?.close();
  });

  it('becomes interactive within 45 s and answers each interaction within 10 s', async () => {
    const findings = manyFindings(100_000, 11);
    const opened = await openReport(context, dir, writeHtml(makeReport(findings)), 'large.html');
    const { page } = opened;
    expect(opened.readyMs).toBeLessThan(45_000);
    expect(await page.locator('#rows > tr').count()).toBe(100);
    expect(await page.textContent('#status')).toBe('100000 findings; showing 1–100');

    const timed = async (action: () => Promise<unknown>, status: RegExp): Promise<number> => {
      const started = performance.now();
      await action();
      await page.waitForFunction((source) => new RegExp(source).test(document.getElementById('status')?.textContent ?? ''), status.source, { timeout: 10_000 });
      return performance.now() - started;
    };
    const errors = findings.filter((f) => f.severity === 'error').length;
    expect(await timed(() => page.selectOption('#f-sev', 'error'), new RegExp(`^${errors} of 100000 findings match`))).toBeLessThan(10_000);
    expect(await timed(() => page.selectOption('#f-sev', ''), /^100000 findings/)).toBeLessThan(10_000);
    expect(await timed(() => page.fill('#f-q', 'finding 99999:'), /^1 of 100000 findings match/)).toBeLessThan(10_000);
    expect(await timed(() => page.fill('#f-q', ''), /^100000 findings/)).toBeLessThan(10_000);
    expect(await timed(() => page.click('th[data-key=subject] button'), /^100000 findings; showing 1–100$/)).toBeLessThan(10_000);
    expect(await timed(() => page.click('#p-last'), /showing 99901–100000$/)).toBeLessThan(10_000);
    expect(await page.locator('#rows > tr').count()).toBe(100);
    expect(opened.consoleErrors).toEqual([]);
    expect(opened.pageErrors).toEqual([]);
    expect(opened.requests).toEqual([]);
  });
});
