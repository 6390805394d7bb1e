/**
 * Report writers on 100,000 findings: milliseconds to lay out each format (median of 3) and the
 * file size, then the time until report.html is interactive in headless Chromium (navigation to the
 * first page of findings rendered; median of 3, fresh page each time, one browser).
 * Run: npm run bench -- report
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { REPORTERS, REPORT_FORMATS, writeReports } from '../../src/report/index.js';
import { makeReport, manyFindings } from '../report/make-report.js';
import { SKIP_MESSAGE, chromiumAvailable, launch, openReport } from '../browser/chromium.js';

const N = 100_000;
const median = (xs: number[]): number => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;

export async function run(): Promise<void> {
  const report = makeReport(manyFindings(N, 5));
  console.log(`${N.toLocaleString('en-US')} findings`);
  console.log('format     median ms   size MB');
  let html = '';
  for (const format of REPORT_FORMATS) {
    const times: number[] = [];
    let text = '';
    for (let i = 0; i < 3; i++) {
      const started = performance.now();
      text = REPORTERS[format].write(report);
      times.push(performance.now() - started);
    }
    if (format === 'html') html = text;
    console.log(`${format.padEnd(10)} ${median(times).toFixed(0).padStart(9)}   ${(Buffer.byteLength(text) / 2 ** 20).toFixed(1).padStart(7)}`);
  }
  const dir = mkdtempSync(join(tmpdir(), 'plumb-bench-report-'));
  const writes: number[] = [];
  for (let i = 0; i < 3; i++) {
    const started = performance.now();
    await writeReports(report, join(dir, 'out'), REPORT_FORMATS);
    writes.push(performance.now() - started);
  }
  console.log(`writeReports, all five formats to disk atomically: median ${median(writes).toFixed(0)} ms`);

  if (!chromiumAvailable) {
    console.log(SKIP_MESSAGE);
    return;
  }
  const { context, dir: browserDir } = await launch();
  try {
    const ready: number[] = [];
    for (let i = 0; i < 3; i++) {
      const opened = await openReport(context, browserDir, html, `bench-${i}.html`);
      ready.push(opened.readyMs);
      await opened.page.close();
    }
    console.log(`report.html interactive in Chromium: median ${median(ready).toFixed(0)} ms (runs ${ready.map((r) => r.toFixed(0)).join(', ')} ms)`);
  } finally {
    await context.close();
    rmSync(dir, { recursive: true, force: true });
  }
}
