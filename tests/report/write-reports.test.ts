import { spawn } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { PlumbError } from '../../src/errors.js';
import { REPORTERS, REPORT_FORMATS, parseFormats, writeFileAtomic, writeReports } from '../../src/report/index.js';
import { validateReport } from '../../src/report/json.js';
import { makeReport, manyFindings } from './make-report.js';

const fresh = (): string => mkdtempSync(join(tmpdir(), 'plumb-report-'));

describe('writeReports', () => {
  it('writes every format under its file name and returns the paths in order', async () => {
    const dir = join(fresh(), 'nested', 'out');
    const report = makeReport(manyFindings(30));
    const paths = await writeReports(report, dir, REPORT_FORMATS, { top: 5 });
    expect(paths.map((p) => p.slice(dir.length + 1))).toEqual(['report.json', 'report.html', 'report.sarif', 'junit.xml', 'summary.md']);
    expect(validateReport(JSON.parse(readFileSync(paths[0]!, 'utf8')))).toEqual([]);
    for (const format of REPORT_FORMATS) {
      expect(readFileSync(join(dir, REPORTERS[format].fileName), 'utf8')).toBe(REPORTERS[format].write(report, { top: 5 }));
    }
    expect(readdirSync(dir).filter((n) => n.endsWith('.partial'))).toEqual([]);
  });

  it('reads --format lists, with all and md, and rejects unknown names with the list of known ones', () => {
    expect(parseFormats('html,json')).toEqual(['json', 'html']);
    expect(parseFormats(['sarif', 'md, junit'])).toEqual(['sarif', 'junit', 'markdown']);
    expect(parseFormats('all')).toEqual(REPORT_FORMATS);
    expect(() => parseFormats('json,pdf')).toThrowError(PlumbError);
    try {
      parseFormats('pdf');
    } catch (error) {
      expect((error as PlumbError).code).toBe('E_USAGE');
      expect((error as PlumbError).hint).toContain('markdown');
    }
  });

  it('turns an unwritable folder into a PlumbError naming the path', async () => {
    const dir = fresh();
    const blocker = join(dir, 'not-a-folder');
    writeFileSync(blocker, 'x');
    await expect(writeReports(makeReport([]), blocker, ['json'])).rejects.toThrowError(/not-a-folder/);
  });

  it('removes its partial file when the write fails', async () => {
    const dir = fresh();
    // Renaming a file onto a folder that holds something fails after the text was written.
    const occupied = join(dir, 'report.json');
    mkdirSync(join(occupied, 'inner'), { recursive: true });
    await expect(writeFileAtomic(occupied, '{"new":true}')).rejects.toThrow();
    expect(readdirSync(dir)).toEqual(['report.json']);
  });

  it('never leaves a truncated report when the writing process is killed, and sweeps its partial file next time', async () => {
    const dir = fresh();
    const target = join(dir, 'report.json');
    const old = `${JSON.stringify({ format: 'plumb-report', old: true })}\n`;
    writeFileSync(target, old);
    const child = spawn(process.execPath, ['--import', 'tsx', resolve('tests/report/write-child.ts'), target, '400'], {
      stdio: ['ignore', 'pipe', 'inherit'],
    });
    let out = '';
    child.stdout.on('data', (chunk: Buffer) => (out += chunk.toString()));
    const exited = new Promise<NodeJS.Signals | null>((done) => child.on('exit', (_code, signal) => done(signal)));
    // Kill as soon as the partial file appears, while the 400 MB are still being written.
    const started = Date.now();
    let sawPartial = false;
    while (Date.now() - started < 30_000 && child.exitCode === null) {
      if (readdirSync(dir).some((n) => n.endsWith('.partial'))) {
        sawPartial = true;
        child.kill('SIGKILL');
        break;
      }
      await new Promise((r) => setTimeout(r, 2));
    }
    const signal = await exited;
    expect(sawPartial).toBe(true);
    expect(signal).toBe('SIGKILL');
    expect(out).not.toContain('done');
    // The report under its real name is the old one, whole.
    expect(readFileSync(target, 'utf8')).toBe(old);
    expect(readdirSync(dir).some((n) => n.endsWith('.partial'))).toBe(true);
    // The next run removes what the killed one left, since its process is gone.
    await writeReports(makeReport([]), dir, ['markdown']);
    expect(readdirSync(dir).filter((n) => n.endsWith('.partial'))).toEqual([]);
    expect(existsSync(join(dir, 'summary.md'))).toBe(true);
  });
});
