import { existsSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium, type BrowserContext, type Page } from 'playwright-core';

/**
 * Debian's headless Chromium driven by playwright-core, for the HTML report tests and the
 * benchmark. `.ci/run` installs the `chromium` package; where it is absent the tests skip and say so.
 */

export const CHROMIUM = '/usr/bin/chromium';
export const chromiumAvailable = existsSync(CHROMIUM);
export const SKIP_MESSAGE = `skipping the browser tests: ${CHROMIUM} is absent (apt-get install chromium; .ci/run installs it)`;

const ARGS = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'];

/** A browser with a fresh profile in a new temporary folder. */
export async function launch(): Promise<{ context: BrowserContext; dir: string }> {
  const dir = mkdtempSync(join(tmpdir(), 'plumb-browser-'));
  const context = await chromium.launchPersistentContext(join(dir, 'profile'), { executablePath: CHROMIUM, headless: true, args: ARGS });
  return { context, dir };
}

export interface OpenedPage {
  page: Page;
  /** Every URL the page asked for other than the report file itself. */
  requests: string[];
  consoleErrors: string[];
  pageErrors: string[];
  dialogs: string[];
  /** Milliseconds from navigation to the findings table being rendered. */
  readyMs: number;
}

/** Writes `html` to a file, opens it from disk and waits until its script has rendered the table. */
export async function openReport(context: BrowserContext, dir: string, html: string, name = 'report.html'): Promise<OpenedPage> {
  const file = join(dir, name);
  writeFileSync(file, html);
  const url = pathToFileURL(file).href;
  const page = await context.newPage();
  const opened: OpenedPage = { page, requests: [], consoleErrors: [], pageErrors: [], dialogs: [], readyMs: 0 };
  // Record, then refuse, anything but the report itself: nothing may leave the page.
  await page.route('**/*', (route) => {
    const target = route.request().url();
    if (target === url) return route.continue();
    opened.requests.push(target);
    return route.abort();
  });
  page.on('request', (request) => {
    if (request.url() !== url && !opened.requests.includes(request.url())) opened.requests.push(request.url());
  });
  page.on('console', (message) => {
    if (message.type() === 'error' || message.type() === 'warning') opened.consoleErrors.push(message.text());
  });
  page.on('pageerror', (error) => opened.pageErrors.push(error.message));
  page.on('dialog', (dialog) => {
    opened.dialogs.push(dialog.message());
    void dialog.dismiss();
  });
  const started = performance.now();
  await page.goto(url, { waitUntil: 'domcontentloaded', timeout: 120_000 });
  await page.waitForSelector('html[data-state=ready]', { timeout: 120_000, state: 'attached' });
  opened.readyMs = performance.now() - started;
  return opened;
}
