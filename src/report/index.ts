import { randomBytes } from 'node:crypto';
import { mkdir, open, readdir, rename, unlink } from 'node:fs/promises';
import { join } from 'node:path';
import { PlumbError } from '../errors.js';
import type { AuditReport } from '../result.js';
import type { ReportOptions } from './common.js';
import { writeHtml } from './html.js';
import { writeJson } from './json.js';
import { writeJunit } from './junit.js';
import { writeMarkdown } from './markdown.js';
import { writeSarif } from './sarif.js';

/**
 * The report writers, by format. Each is a pure function from the report to the file's text;
 * `writeReports` puts them on disk, each atomically.
 */

export type ReportFormat = 'json' | 'html' | 'sarif' | 'junit' | 'markdown';

export interface Reporter {
  fileName: string;
  write(report: AuditReport, options?: ReportOptions): string;
}

export const REPORTERS: Record<ReportFormat, Reporter> = {
  json: { fileName: 'report.json', write: (report) => writeJson(report) },
  html: { fileName: 'report.html', write: (report) => writeHtml(report) },
  sarif: { fileName: 'report.sarif', write: (report) => writeSarif(report) },
  junit: { fileName: 'junit.xml', write: (report, options) => writeJunit(report, options) },
  markdown: { fileName: 'summary.md', write: (report, options) => writeMarkdown(report, options) },
};

/** In the order `--help` lists them and `writeReports` writes them. */
export const REPORT_FORMATS = Object.keys(REPORTERS) as ReportFormat[];

export function isReportFormat(name: string): name is ReportFormat {
  return Object.prototype.hasOwnProperty.call(REPORTERS, name);
}

/**
 * Reads `--format json,html` (or a list of such strings) into formats, in the registry's order,
 * each once; `all` means every format. An unknown name is a usage error that lists the known ones.
 */
export function parseFormats(value: string | readonly string[]): ReportFormat[] {
  const names = (typeof value === 'string' ? [value] : value).flatMap((v) => v.split(',')).map((v) => v.trim().toLowerCase()).filter(Boolean);
  const wanted = new Set<ReportFormat>();
  for (const name of names) {
    if (name === 'all') REPORT_FORMATS.forEach((f) => wanted.add(f));
    else if (name === 'md') wanted.add('markdown');
    else if (isReportFormat(name)) wanted.add(name);
    else throw new PlumbError('E_USAGE', `unknown report format "${name}"`, { hint: `choose from ${REPORT_FORMATS.join(', ')} (or all)` });
  }
  return REPORT_FORMATS.filter((f) => wanted.has(f));
}

const TEMP_PATTERN = /^\.(.+)\.(\d+)\.[0-9a-f]{8}\.partial$/;

function processAlive(pid: number): boolean {
  if (pid === process.pid) return true;
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    // EPERM: the process exists but belongs to someone else.
    return (error as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/** Removes the partial files a killed earlier run left in `dir`; another live run's files are left alone. */
async function sweepPartials(dir: string): Promise<void> {
  let names: string[];
  try {
    names = await readdir(dir);
  } catch {
    return;
  }
  for (const name of names) {
    const m = TEMP_PATTERN.exec(name);
    if (m && !processAlive(Number(m[2]))) await unlink(join(dir, name)).catch(() => {});
  }
}

/**
 * Writes `text` to `path` so that readers see either the old file or the whole new one: the text
 * goes to a partial file in the same folder, is flushed to disk, and is renamed over `path`
 * (rename within one file system is atomic on POSIX). A failure removes the partial file.
 */
export async function writeFileAtomic(path: string, text: string): Promise<void> {
  const slash = Math.max(path.lastIndexOf('/'), path.lastIndexOf('\\'));
  const dir = slash < 0 ? '.' : path.slice(0, slash) || '/';
  const base = path.slice(slash + 1);
  const temp = join(dir, `.${base}.${process.pid}.${randomBytes(4).toString('hex')}.partial`);
  const handle = await open(temp, 'wx', 0o644);
  try {
    try {
      await handle.writeFile(text, 'utf8');
      await handle.sync();
    } finally {
      await handle.close();
    }
    await rename(temp, path);
  } catch (error) {
    await unlink(temp).catch(() => {});
    throw error;
  }
}

/**
 * Writes the report in each format to `outDir` (created when missing), each file atomically, and
 * returns the paths written in the order of `formats`.
 */
export async function writeReports(
  report: AuditReport,
  outDir: string,
  formats: readonly ReportFormat[],
  options: ReportOptions = {},
): Promise<string[]> {
  try {
    await mkdir(outDir, { recursive: true });
  } catch (error) {
    throw new PlumbError('E_INPUT', `cannot create the report folder ${outDir}: ${(error as Error).message}`, {
      hint: 'choose another folder with --out',
      cause: error,
    });
  }
  await sweepPartials(outDir);
  const written: string[] = [];
  for (const format of formats) {
    const reporter = REPORTERS[format];
    const path = join(outDir, reporter.fileName);
    const text = reporter.write(report, options);
    try {
      await writeFileAtomic(path, text);
    } catch (error) {
      throw new PlumbError('E_INPUT', `cannot write ${path}: ${(error as Error).message}`, {
        hint: 'check that the folder given with --out is writable and the disk is not full',
        cause: error,
      });
    }
    written.push(path);
  }
  return written;
}

export type { ReportOptions } from './common.js';
export { formatTerminalSummary, createProgressSink, type TerminalOptions } from './terminal.js';
export { validateReport } from './json.js';
