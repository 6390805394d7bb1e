import { createHash } from 'node:crypto';
import { SEVERITIES, type Finding, type FindingKind } from '../findings.js';
import type { AuditReport } from '../result.js';
import { NOT_VERDICTS_HEAD, NOT_VERDICTS_TAIL, compareText, formatCount, formatShare, sourceLabel, truncate } from './common.js';
import { REPORT_SCRIPT, REPORT_STYLES } from './html-assets.js';

/**
 * `report.html`: one self-contained page for reviewers, readable offline and in print. The
 * summary, inputs, options, histogram and per-predicate table are laid out here as static markup
 * (every string escaped); the findings travel as a JSON data block and the inline script renders
 * one page of them at a time, so that 100,000 findings stay responsive.
 *
 * Nothing on the page loads from anywhere: a Content-Security-Policy allows only the page's own
 * style block and script block, by their SHA-256 hashes (CSP Level 3 hash sources), and nothing
 * else — no images, fonts, frames, fetches nor form posts.
 */

/** Longest term or message carried into the page; the full text stays in report.json. */
const MAX_TERM = 20_000;
const MAX_EVIDENCE_STRING = 2_000;
const MAX_EVIDENCE_ITEMS = 100;
/** Rows of the per-predicate and suppressed tables laid out; the rest are counted. */
const MAX_TABLE_ROWS = 1_000;

const HTML_ESCAPES: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' };

/** Escapes text for element content and quoted attribute values alike. */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => HTML_ESCAPES[c] ?? c);
}

/**
 * JSON for a `<script type="application/json">` block: `<`, `>` and `&` become `\u003c`, `\u003e`,
 * `\u0026`, so no data can close the block or open a comment inside it (HTML Living Standard,
 * "script data" state), and U+2028/U+2029 are escaped too so the text is also valid JavaScript.
 */
export function embedJson(value: unknown): string {
  return JSON.stringify(value).replace(/[<>&\u2028\u2029]/g, (c) => `\\u${c.charCodeAt(0).toString(16).padStart(4, '0')}`);
}

/** The URL an IRI may link to: only `http:` and `https:` IRIs that parse, nothing else. */
export function safeHref(iri: string): string | undefined {
  if (!/^https?:\/\//i.test(iri) || /[\s"<>\\^`{|}]/.test(iri)) return undefined;
  try {
    const url = new URL(iri);
    return url.protocol === 'http:' || url.protocol === 'https:' ? url.href : undefined;
  } catch {
    return undefined;
  }
}

function termHtml(key: string, max = 300): string {
  if (key === '') return '<span class="empty">none</span>';
  const text = escapeHtml(truncate(key, max));
  if (key.startsWith('"')) return `<bdi class="term lit">${text}</bdi>`;
  if (key.startsWith('_:')) return `<bdi class="term bnode">${text}</bdi>`;
  const href = safeHref(key);
  return href
    ? `<bdi class="term"><a href="${escapeHtml(href)}" rel="noopener noreferrer">${text}</a></bdi>`
    : `<bdi class="term iri">${text}</bdi>`;
}

function limitEvidence(value: unknown, depth = 0): unknown {
  if (typeof value === 'string') return truncate(value, MAX_EVIDENCE_STRING);
  if (typeof value === 'number' && !Number.isFinite(value)) return String(value);
  if (value === null || typeof value !== 'object') return value;
  if (depth > 6) return '…';
  if (Array.isArray(value)) {
    const items = value.slice(0, MAX_EVIDENCE_ITEMS).map((v) => limitEvidence(v, depth + 1));
    if (value.length > MAX_EVIDENCE_ITEMS) items.push(`… ${value.length - MAX_EVIDENCE_ITEMS} more`);
    return items;
  }
  const out: Record<string, unknown> = {};
  for (const key of Object.keys(value).sort()) out[key] = limitEvidence((value as Record<string, unknown>)[key], depth + 1);
  return out;
}

/** The compact record the page's script reads (one-letter keys: 100,000 of them are embedded). */
function pageRecord(f: Finding): Record<string, unknown> {
  const r: Record<string, unknown> = {
    k: f.kind,
    c: f.check,
    v: f.severity,
    s: truncate(f.subject, MAX_TERM),
    p: truncate(f.predicate, MAX_TERM),
    o: truncate(f.object, MAX_TERM),
    m: truncate(f.message, MAX_TERM),
  };
  if (f.graph !== undefined) r.g = truncate(f.graph, MAX_TERM);
  if (f.source) {
    r.f = truncate(f.source.file, 1000);
    r.l = f.source.line;
    if (f.source.column !== undefined) r.n = f.source.column;
  }
  if (f.plausibility !== undefined) r.x = f.plausibility;
  if (f.rank !== undefined) r.r = f.rank;
  r.e = limitEvidence(f.evidence);
  return r;
}

function cspHash(text: string): string {
  return `'sha256-${createHash('sha256').update(text, 'utf8').digest('base64')}'`;
}

function tile(n: number | string, label: string, cls = ''): string {
  return `<div class="tile"><span class="n${cls ? ` ${cls}` : ''}">${escapeHtml(typeof n === 'number' ? formatCount(n) : n)}</span><span class="l">${escapeHtml(label)}</span></div>`;
}

function summaryHtml(report: AuditReport): string {
  const s = report.summary;
  const kinds: FindingKind[] = ['violation', 'suspect', 'syntax'];
  const tiles = [
    tile(s.findings, 'findings'),
    ...SEVERITIES.map((sev) => tile(s.bySeverity[sev], `${sev}s`, `sev-${sev}`)),
    ...kinds.map((k) => tile(s.byKind[k], `${k === 'syntax' ? 'syntax findings' : `${k}s`}`)),
    tile(s.scored, 'triples scored by the model'),
  ];
  if (report.suppressed && report.suppressed.length > 0) tiles.push(tile(report.suppressed.length, 'accepted by suppressions'));
  const parts = [`<div class="tiles">${tiles.join('')}</div>`];
  if (report.gate) {
    const g = report.gate;
    const list = g.crossed.length > 0 ? `<ul>${g.crossed.map((c) => `<li>${escapeHtml(c)}</li>`).join('')}</ul>` : '';
    const supp =
      g.suppressed > 0 || g.expiredSuppressions > 0
        ? `<p>${formatCount(g.suppressed)} accepted by the suppressions file; ${formatCount(g.expiredSuppressions)} whose suppression expired came back.</p>`
        : '';
    parts.push(
      `<div class="gate ${g.passed ? 'passed' : 'failed'}" role="status"><strong>Gate ${g.passed ? 'passed' : 'failed'}.</strong>${list}${supp}</div>`,
    );
  }
  const t = s.trust;
  parts.push('<h3>How far the ranking can be trusted here</h3>');
  if (t) {
    const kindsRows = Object.keys(t.byKind)
      .sort(compareText)
      .map((k) => {
        const r = t.byKind[k]!;
        return `<tr><td>${escapeHtml(k)}</td><td class="num">${formatCount(r.injected)}</td><td class="num">${formatShare(r.averagePrecision)}</td><td class="num">${formatShare(r.precisionAtK)}</td></tr>`;
      })
      .join('');
    parts.push(
      `<div class="tiles">${tile(formatShare(t.averagePrecision), 'average precision on planted errors')}${tile(formatShare(t.baseline), 'what a random order would score')}${tile(formatShare(t.precisionAtK), `precision among the top ${formatCount(t.injected)}`)}${tile(t.injected, 'errors planted in a copy')}</div>`,
      `<p>${escapeHtml(t.verdict)}</p>`,
    );
    if (kindsRows) {
      parts.push(
        `<div class="scroll"><table><caption class="vh">Trust figure by kind of planted error</caption><thead><tr><th scope="col">planted error</th><th scope="col" class="num">planted</th><th scope="col" class="num">average precision</th><th scope="col" class="num">precision@K</th></tr></thead><tbody>${kindsRows}</tbody></table></div>`,
      );
    }
  } else {
    parts.push(`<p class="empty">${escapeHtml(noTrustReason(report))}</p>`);
  }
  const a = report.accounting;
  parts.push(
    `<p>Read ${formatCount(a.read)} statements: ${formatCount(a.accepted)} accepted, ${formatCount(a.duplicates)} duplicates, ${formatCount(a.rejected)} rejected.</p>`,
  );
  return parts.join('\n');
}

/** Why a report has no trust figure, from what the run recorded. */
export function noTrustReason(report: AuditReport): string {
  const head = 'No trust figure for this run:';
  if (report.summary.scored === 0) return `${head} the model did not run, so there was no ranking to measure.`;
  if (report.options.calibrate === true) return `${head} too few triples could take a planted error to measure the ranking.`;
  if (report.command === 'gate') return `${head} the gate ranks only the incoming triples and does not plant errors. Run plumb audit on the merged graph for one.`;
  return `${head} it was not measured (--no-calibrate, or the default on large graphs). Pass --calibrate to measure the ranking on planted errors.`;
}

function inputsHtml(report: AuditReport): string {
  const rows = report.inputs
    .map(
      (i) =>
        `<tr><td class="mono">${escapeHtml(truncate(i.path, 500))}</td><td>${escapeHtml(i.format)}</td><td class="num">${formatCount(i.bytes)}</td><td class="num">${formatCount(i.statements)}</td><td class="hash">${escapeHtml(i.sha256)}</td></tr>`,
    )
    .join('');
  const inputs =
    report.inputs.length === 0
      ? '<p class="empty">No input files recorded.</p>'
      : `<div class="scroll"><table><thead><tr><th scope="col">file</th><th scope="col">format</th><th scope="col" class="num">bytes</th><th scope="col" class="num">statements</th><th scope="col">sha256</th></tr></thead><tbody>${rows}</tbody></table></div>`;
  const run: [string, string][] = [
    ['command', report.command],
    ['plumb version', report.tool.version],
    ['created', report.createdAt],
  ];
  if (report.backend !== undefined) run.push(['backend', report.backend]);
  if (report.seed !== undefined) run.push(['seed', String(report.seed)]);
  if (report.folds !== undefined) run.push(['folds', String(report.folds)]);
  for (const key of Object.keys(report.durations).sort(compareText)) run.push([`${key} (s)`, (report.durations[key] ?? 0).toFixed(2)]);
  const options = Object.keys(report.options)
    .sort(compareText)
    .map((k) => [k, truncate(JSON.stringify(report.options[k]) ?? 'undefined', 500)] as [string, string]);
  const kv = (pairs: [string, string][]): string =>
    `<dl class="kv">${pairs.map(([k, v]) => `<dt>${escapeHtml(k)}</dt><dd class="mono">${escapeHtml(v)}</dd>`).join('')}</dl>`;
  return `<h3>Inputs</h3>${inputs}<h3>Run</h3>${kv(run)}<h3>Options</h3>${options.length === 0 ? '<p class="empty">Defaults only.</p>' : kv(options)}`;
}

/** 20 bars of width 0.05; the lowest bins (below 0.1) drawn in the warning colour. */
function histogramHtml(report: AuditReport): string {
  const bins = report.plausibilityHistogram;
  if (!bins || bins.length === 0 || bins.every((b) => b === 0)) {
    return '<p class="empty">No plausibility histogram: the model did not score this graph.</p>';
  }
  const W = 640;
  const H = 220;
  const left = 48;
  const bottom = 28;
  const top = 12;
  const plotW = W - left - 12;
  const plotH = H - bottom - top;
  const max = Math.max(...bins);
  const bw = plotW / bins.length;
  const bars = bins
    .map((count, i) => {
      const h = max === 0 ? 0 : (count / max) * plotH;
      const x = left + i * bw;
      const lo = (i * 0.05).toFixed(2);
      const hi = ((i + 1) * 0.05).toFixed(2);
      return `<rect class="bar${i < 2 ? ' low' : ''}" x="${(x + 1).toFixed(1)}" y="${(top + plotH - h).toFixed(1)}" width="${(bw - 2).toFixed(1)}" height="${h.toFixed(1)}"><title>${lo}–${hi}: ${formatCount(count)} triples</title></rect>`;
    })
    .join('');
  const ticks = [0, 0.25, 0.5, 0.75, 1]
    .map((v) => `<text x="${(left + v * plotW).toFixed(1)}" y="${H - 8}" text-anchor="middle">${v}</text>`)
    .join('');
  const rows = bins.map((count, i) => `<tr><td>${(i * 0.05).toFixed(2)}–${((i + 1) * 0.05).toFixed(2)}</td><td class="num">${formatCount(count)}</td></tr>`).join('');
  return (
    `<svg viewBox="0 0 ${W} ${H}" role="img" aria-labelledby="hist-title"><title id="hist-title">Scored triples by plausibility, 20 bins from 0 to 1; the tallest bin holds ${formatCount(max)}</title>` +
    `<line class="axis" x1="${left}" y1="${top + plotH}" x2="${left + plotW}" y2="${top + plotH}"/><line class="axis" x1="${left}" y1="${top}" x2="${left}" y2="${top + plotH}"/>` +
    `<text x="${left - 6}" y="${top + 4}" text-anchor="end">${formatCount(max)}</text><text x="${left - 6}" y="${top + plotH}" text-anchor="end">0</text>${ticks}${bars}</svg>` +
    `<details class="noprint"><summary>The same counts as a table</summary><table><thead><tr><th scope="col">plausibility</th><th scope="col" class="num">triples</th></tr></thead><tbody>${rows}</tbody></table></details>`
  );
}

function predicatesHtml(report: AuditReport): string {
  if (report.predicates.length === 0) return '<p class="empty">No predicates recorded.</p>';
  const rows = [...report.predicates].sort(
    (a, b) => b.violations + b.suspects - (a.violations + a.suspects) || b.triples - a.triples || compareText(a.predicate, b.predicate),
  );
  const shown = rows.slice(0, MAX_TABLE_ROWS);
  const body = shown
    .map(
      (r) =>
        `<tr><td>${termHtml(r.predicate)}</td><td class="num">${formatCount(r.triples)}</td><td class="num">${formatCount(r.violations)}</td><td class="num">${formatCount(r.suspects)}</td></tr>`,
    )
    .join('');
  const more = rows.length > shown.length ? `<p class="empty">${formatCount(rows.length - shown.length)} more predicates with fewer findings are in report.json.</p>` : '';
  return `<div class="scroll"><table><thead><tr><th scope="col">predicate</th><th scope="col" class="num">triples</th><th scope="col" class="num">violations</th><th scope="col" class="num">suspects</th></tr></thead><tbody>${body}</tbody></table></div>${more}`;
}

function suppressedHtml(report: AuditReport): string {
  const list = report.suppressed ?? [];
  if (list.length === 0) return '';
  const body = list
    .slice(0, MAX_TABLE_ROWS)
    .map(
      ({ finding: f, suppression: s }) =>
        `<tr><td class="mono">${escapeHtml(f.check)}</td><td>${termHtml(f.subject, 120)} ${termHtml(f.predicate, 120)} ${termHtml(f.object, 120)}</td><td>${escapeHtml(truncate(s.reason, 500))}</td><td class="mono">${escapeHtml(s.expires ?? 'never')}</td><td class="mono">${escapeHtml(sourceLabel(f))}</td></tr>`,
    )
    .join('');
  return (
    `<section id="suppressed" aria-labelledby="h-suppressed"><h2 id="h-suppressed">Accepted by the suppressions file (${formatCount(list.length)})</h2>` +
    `<div class="scroll"><table><thead><tr><th scope="col">check</th><th scope="col">triple</th><th scope="col">reason</th><th scope="col">expires</th><th scope="col">source</th></tr></thead><tbody>${body}</tbody></table></div></section>`
  );
}

const FINDINGS_SECTION = `<section id="findings" aria-labelledby="h-findings">
<h2 id="h-findings">Findings</h2>
<noscript><p>The findings table needs JavaScript; report.json and summary.md hold the same findings.</p></noscript>
<div class="controls" id="controls" role="search" hidden>
<label>Kind <select id="f-kind"><option value="">all</option></select></label>
<label>Severity <select id="f-sev"><option value="">all</option></select></label>
<label>Check <select id="f-check"><option value="">all</option></select></label>
<label>Predicate <select id="f-pred"><option value="">all</option></select></label>
<label>Search <input type="search" id="f-q" placeholder="text in terms, message or file" autocomplete="off"></label>
<label>Rows per page <select id="f-size"><option>25</option><option>50</option><option selected>100</option><option>250</option></select></label>
<button type="button" id="f-reset">Clear filters</button>
</div>
<p class="status" id="status" aria-live="polite"></p>
<div class="scroll"><table id="findings-table">
<caption class="vh">Findings, ranked; sortable by column</caption>
<thead><tr><th scope="col"><span class="vh">Details</span></th><th scope="col" class="num" data-key="order"><button type="button">#</button></th><th scope="col" data-key="severity"><button type="button">severity</button></th><th scope="col" data-key="kind"><button type="button">kind</button></th><th scope="col" data-key="check"><button type="button">check</button></th><th scope="col" data-key="subject"><button type="button">subject</button></th><th scope="col" data-key="predicate"><button type="button">predicate</button></th><th scope="col" data-key="object"><button type="button">object</button></th><th scope="col" class="num" data-key="plausibility"><button type="button">plausibility</button></th><th scope="col" data-key="source"><button type="button">source</button></th></tr></thead>
<tbody id="rows"></tbody>
</table></div>
<nav class="pager" id="pager" aria-label="Pages of findings" hidden><button type="button" id="p-first">First</button><button type="button" id="p-prev">Previous</button><span id="p-info"></span><button type="button" id="p-next">Next</button><button type="button" id="p-last">Last</button></nav>
</section>`;

/** Lays the report out as one self-contained HTML page. */
export function writeHtml(report: AuditReport): string {
  const csp = [
    "default-src 'none'",
    `style-src ${cspHash(REPORT_STYLES)}`,
    `script-src ${cspHash(REPORT_SCRIPT)}`,
    "img-src 'none'",
    "connect-src 'none'",
    "base-uri 'none'",
    "form-action 'none'",
  ].join('; ');
  const title = `plumb ${report.command} report`;
  const data = embedJson({ findings: report.findings.map(pageRecord) });
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="${escapeHtml(csp)}">
<meta name="referrer" content="no-referrer">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="generator" content="plumb ${escapeHtml(report.tool.version)}">
<title>${escapeHtml(title)}</title>
<style>${REPORT_STYLES}</style>
</head>
<body>
<header class="masthead"><h1>${escapeHtml(title)}</h1><p>${escapeHtml(report.createdAt)} · plumb ${escapeHtml(report.tool.version)} · ${report.inputs.length} input${report.inputs.length === 1 ? '' : 's'}</p></header>
<main>
<section class="caveat" role="note" aria-label="How to read this report"><p><strong>${escapeHtml(NOT_VERDICTS_HEAD)}</strong> ${escapeHtml(NOT_VERDICTS_TAIL)}</p><p>A suspect is a triple the model finds unusual given the rest of the graph; rare facts that are true look unusual too. A violation breaks a declared or mined constraint; the constraint itself may be what is wrong.</p></section>
<section id="summary" aria-labelledby="h-summary"><h2 id="h-summary">Summary</h2>
${summaryHtml(report)}
</section>
<section id="inputs" aria-labelledby="h-inputs"><h2 id="h-inputs">Inputs and options</h2>
${inputsHtml(report)}
</section>
<section id="histogram" class="hist" aria-labelledby="h-hist"><h2 id="h-hist">Plausibility of scored triples</h2>
${histogramHtml(report)}
</section>
<section id="predicates" aria-labelledby="h-predicates"><h2 id="h-predicates">By predicate</h2>
${predicatesHtml(report)}
</section>
${FINDINGS_SECTION}
${suppressedHtml(report)}
</main>
<script type="application/json" id="plumb-data">${data}</script>
<script>${REPORT_SCRIPT}</script>
</body>
</html>
`;
}

