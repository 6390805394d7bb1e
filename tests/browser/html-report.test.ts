import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import type { Finding } from '../../src/findings.js';
import { writeHtml } from '../../src/report/html.js';
import { finding, makeReport, manyFindings } from '../report/make-report.js';
import { SKIP_MESSAGE, chromiumAvailable, launch, openReport, type OpenedPage } from './chromium.js';

if (!chromiumAvailable) console.warn(SKIP_MESSAGE);

const EX = 'http://example.org/orchard/';
const IMG = `"><img src=x onerror="window.__pwned='img'">`;
const SCRIPT = `<script>window.__pwned='script'</script>`;
const BREAKOUT = `</script><script>window.__pwned='breakout'</script><!--`;
const RTL = '"שלום עולם \u202eevil\u202c مرحبا"@he';
const COMBINING = '"e\u0301\u0302 Z\u0351\u0352\u0353 a\u0308"';
const BIG = `"${'long literal '.repeat(Math.ceil((5 * 1024 * 1024) / 13))}"`;

function hostileFindings(): Finding[] {
  return [
    finding({ subject: `${EX}x${IMG}`, object: `"${SCRIPT}"`, message: `message ${IMG} ${SCRIPT}`, check: `range${IMG}` }),
    finding({ subject: `javascript:window.__pwned='js'`, predicate: `JaVaScRiPt:alert(1)`, object: ` javascript:alert(2)`, message: 'javascript IRIs' }),
    finding({ object: `"${BREAKOUT}\u2028\u2029"`, message: BREAKOUT, source: { file: `data/${IMG}.ttl`, line: 4, column: 2 } }),
    finding({ object: RTL, message: 'right-to-left', kind: 'suspect', check: 'model', severity: 'warning', plausibility: 0.01, rank: 1 }),
    finding({ object: COMBINING, message: 'combining marks' }),
    finding({ object: BIG, message: 'five megabytes' }),
    finding({
      message: 'evidence payloads',
      evidence: {
        note: `${IMG}${SCRIPT}`,
        alternatives: [`javascript:window.__pwned='alt'`, { object: `${EX}plot/2`, plausibility: 0.9, label: SCRIPT }, `${EX}plot/${IMG}`],
        nested: { deeper: [SCRIPT, { x: BREAKOUT }] },
      },
    }),
  ];
}

function hostileReport() {
  return makeReport(hostileFindings(), {
    inputs: [{ path: `data/${IMG}${SCRIPT}.ttl`, format: 'turtle', bytes: 10, sha256: 'c'.repeat(64), statements: 7 }],
    options: { out: IMG, schema: [SCRIPT] },
    gate: { passed: false, crossed: [`1 error > --max-errors 0 ${IMG}`], thresholds: { maxErrors: 0 }, suppressed: 1, expiredSuppressions: 0 },
    suppressed: [{ finding: finding({ subject: `${EX}s${IMG}` }), suppression: { reason: `because ${SCRIPT}` } }],
  });
}

async function statusText(page: Page): Promise<string> {
  return (await page.locator('#status').textContent()) ?? '';
}

async function waitStatus(page: Page, pattern: RegExp): Promise<void> {
  await page.waitForFunction((source) => new RegExp(source).test(document.getElementById('status')?.textContent ?? ''), pattern.source, { timeout: 10_000 });
}

async function visibleNumbers(page: Page): Promise<number[]> {
  return page.$$eval('#rows > tr:not(.detail) > td:nth-child(2)', (cells) => cells.map((c) => Number(c.textContent)));
}

describe.skipIf(!chromiumAvailable)('report.html in headless Chromium', () => {
  let context: BrowserContext;
  let dir: string;

  beforeAll(async () => {
    ({ context, dir } = await launch());
  });
  afterAll(async () => {
    await context?.close();
  });

  describe('with hostile data', () => {
    let opened: OpenedPage;
    beforeAll(async () => {
      opened = await openReport(context, dir, writeHtml(hostileReport()), 'hostile.html');
    });

    it('runs no script from the data, opens no dialog, logs no error and sends no request', async () => {
      const { page } = opened;
      expect(await page.evaluate(() => (window as unknown as { __pwned?: string }).__pwned)).toBeUndefined();
      expect(opened.dialogs).toEqual([]);
      expect(opened.pageErrors).toEqual([]);
      expect(opened.consoleErrors).toEqual([]);
      expect(opened.requests).toEqual([]);
      expect(await page.locator('img').count()).toBe(0);
      expect(await page.evaluate(() => document.scripts.length)).toBe(2);
    });

    it('shows the payloads as text and links only http and https IRIs', async () => {
      const { page } = opened;
      const hrefs = await page.$$eval('a[href]', (links) => links.map((a) => a.getAttribute('href') ?? ''));
      expect(hrefs.length).toBeGreaterThan(0);
      for (const href of hrefs) expect(href).toMatch(/^https?:\/\//);
      const body = (await page.textContent('body')) ?? '';
      expect(body).toContain(`javascript:window.__pwned='js'`);
      expect(body).toContain(IMG);
      expect(body).toContain(`because ${SCRIPT}`);
      // Expand every row: details must not run or link anything either.
      const buttons = page.locator('button.expand');
      const count = await buttons.count();
      for (let i = 0; i < count; i++) await page.locator('button.expand[aria-expanded=false]').first().click();
      expect(await page.locator('tr.detail').count()).toBe(count);
      const detailHrefs = await page.$$eval('tr.detail a[href]', (links) => links.map((a) => a.getAttribute('href') ?? ''));
      for (const href of detailHrefs) expect(href).toMatch(/^https?:\/\//);
      const details = (await page.textContent('#rows')) ?? '';
      expect(details).toContain(`javascript:window.__pwned='alt'`);
      expect(details).toContain(BREAKOUT);
      expect(await page.locator('img').count()).toBe(0);
      expect(await page.evaluate(() => (window as unknown as { __pwned?: string }).__pwned)).toBeUndefined();
      expect(opened.consoleErrors).toEqual([]);
      expect(opened.requests).toEqual([]);
    });

    it('keeps right-to-left and combining characters exactly, isolated so they cannot reorder the row', async () => {
      const { page } = opened;
      const terms = await page.$$eval('tr.detail bdi.term', (nodes) => nodes.map((n) => n.textContent));
      expect(terms).toContain(RTL);
      expect(terms).toContain(COMBINING);
    });

    it('shows a 5 MB literal cut, saying how much was left out', async () => {
      const { page } = opened;
      const cell = await page.$$eval('#rows > tr:not(.detail) bdi.term.lit', (nodes) => nodes.map((n) => n.textContent ?? '').find((t) => t.startsWith('"long literal')));
      expect(cell).toBeDefined();
      expect(cell!.length).toBeLessThan(200);
      expect(cell).toMatch(/more characters\)$/);
    });
  });

  describe('interaction', () => {
    const findings = manyFindings(1_000, 3);
    let page: Page;
    let opened: OpenedPage;
    beforeAll(async () => {
      opened = await openReport(context, dir, writeHtml(makeReport(findings)), 'interaction.html');
      page = opened.page;
    });

    it('opens with the caveat and the summary first, then the histogram, predicates and findings', async () => {
      const order = await page.$$eval('main > section', (sections) => sections.map((s) => s.id || s.className));
      expect(order.slice(0, 6)).toEqual(['caveat', 'summary', 'inputs', 'histogram', 'predicates', 'findings']);
      expect(await page.textContent('.caveat')).toContain('candidates for review, not verdicts');
      expect(await page.locator('#histogram svg rect.bar').count()).toBe(20);
      expect(await statusText(page)).toBe('1000 findings; showing 1–100');
      expect(await visibleNumbers(page)).toEqual(Array.from({ length: 100 }, (_, i) => i + 1));
    });

    it('sorts by a column both ways, with aria-sort saying which', async () => {
      const plaus = findings.map((f) => f.plausibility).filter((x): x is number => x !== undefined);
      const header = page.locator('th[data-key=plausibility]');
      await header.locator('button').click();
      expect(await header.getAttribute('aria-sort')).toBe('ascending');
      const firstAsc = await page.locator('#rows > tr:first-child > td:nth-child(9)').textContent();
      expect(firstAsc).toBe(Math.min(...plaus).toFixed(3));
      await header.locator('button').click();
      expect(await header.getAttribute('aria-sort')).toBe('descending');
      const firstDesc = await page.locator('#rows > tr:first-child > td:nth-child(9)').textContent();
      expect(firstDesc).toBe(Math.max(...plaus).toFixed(3));
      await page.locator('th[data-key=order] button').click();
      expect(await visibleNumbers(page).then((n) => n[0])).toBe(1);
    });

    it('filters by kind, severity, check and predicate', async () => {
      const errors = findings.filter((f) => f.severity === 'error').length;
      await page.selectOption('#f-sev', 'error');
      await waitStatus(page, new RegExp(`^${errors} of 1000 findings match`));
      const badges = await page.$$eval('#rows .badge', (b) => b.map((x) => x.textContent));
      expect(badges.length).toBe(Math.min(errors, 100));
      expect(new Set(badges)).toEqual(new Set(['error']));
      await page.selectOption('#f-sev', '');
      const predicate = findings[5]!.predicate;
      const check = 'model';
      await page.selectOption('#f-check', check);
      await page.selectOption('#f-pred', predicate);
      await page.selectOption('#f-kind', 'suspect');
      const expected = findings.filter((f) => f.check === check && f.predicate === predicate && f.kind === 'suspect').length;
      await waitStatus(page, new RegExp(`^${expected} of 1000 findings match`));
      await page.click('#f-reset');
      await waitStatus(page, /^1000 findings/);
    });

    it('searches the text of terms, messages and file names', async () => {
      const target = findings[437]!;
      const needle = target.message.split(':')[0]!; // "Finding 438"
      const expected = findings.filter((f) => f.message.toLowerCase().includes(needle.toLowerCase()) || f.subject.includes(needle)).length;
      await page.fill('#f-q', needle.toUpperCase());
      await waitStatus(page, new RegExp(`^${expected} of 1000 findings match`));
      expect(await visibleNumbers(page)).toContain(438);
      await page.fill('#f-q', 'no such text anywhere');
      await waitStatus(page, /^0 of 1000 findings match/);
      expect(await page.textContent('#rows')).toContain('No finding matches');
      await page.fill('#f-q', '');
      await waitStatus(page, /^1000 findings/);
    });

    it('pages through the findings, rendering one page at a time', async () => {
      await page.click('#p-next');
      await waitStatus(page, /showing 101–200$/);
      expect((await visibleNumbers(page))[0]).toBe(101);
      await page.click('#p-last');
      await waitStatus(page, /showing 901–1000$/);
      expect(await page.locator('#p-next').isDisabled()).toBe(true);
      await page.click('#p-first');
      expect(await page.locator('#p-prev').isDisabled()).toBe(true);
      await page.selectOption('#f-size', '25');
      await waitStatus(page, /showing 1–25$/);
      expect(await page.locator('#rows > tr').count()).toBe(25);
      expect(await page.textContent('#p-info')).toBe('Page 1 of 40');
      await page.selectOption('#f-size', '100');
    });

    it('expands a row to its evidence, alternatives and source, by mouse and by keyboard', async () => {
      const suspectIndex = findings.findIndex((f) => f.kind === 'suspect');
      const s = findings[suspectIndex]!;
      const button = page.locator(`button.expand[data-index="${suspectIndex}"]`);
      await button.click();
      expect(await button.getAttribute('aria-expanded')).toBe('true');
      const detail = page.locator(`#detail-${suspectIndex}`);
      expect(await detail.isVisible()).toBe(true);
      const text = (await detail.textContent()) ?? '';
      expect(text).toContain('Preferred alternatives');
      expect(text).toContain((s.evidence.alternatives as { object: string }[])[0]!.object);
      expect(text).toContain(`${s.source!.file}:${s.source!.line}:${s.source!.column}`);
      expect(text).toContain('Evidence');
      expect(text).toContain('objectRank');
      // The button keeps focus after the table re-renders; Enter and Space toggle it.
      expect(await page.evaluate(() => document.activeElement?.getAttribute('data-index'))).toBe(String(suspectIndex));
      await page.keyboard.press('Enter');
      expect(await page.locator(`#detail-${suspectIndex}`).count()).toBe(0);
      await page.keyboard.press('Space');
      expect(await page.locator(`#detail-${suspectIndex}`).count()).toBe(1);
      // Tab reaches the controls: every control is a native, focusable element.
      await page.focus('#f-q');
      await page.keyboard.press('Shift+Tab');
      expect(await page.evaluate(() => document.activeElement?.id)).toBe('f-pred');
    });

    it('prints without the controls', async () => {
      await page.emulateMedia({ media: 'print' });
      expect(await page.locator('#controls').isVisible()).toBe(false);
      expect(await page.locator('#pager').isVisible()).toBe(false);
      expect(await page.locator('#summary').isVisible()).toBe(true);
      await page.emulateMedia({ media: 'screen' });
      expect(opened.consoleErrors).toEqual([]);
      expect(opened.pageErrors).toEqual([]);
      expect(opened.requests).toEqual([]);
    });
  });
});
