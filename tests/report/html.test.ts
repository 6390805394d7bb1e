import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { embedJson, escapeHtml, noTrustReason, safeHref, writeHtml } from '../../src/report/html.js';
import { REPORT_SCRIPT, REPORT_STYLES } from '../../src/report/html-assets.js';
import { finding, makeReport, manyFindings } from './make-report.js';

const hash = (text: string): string => `'sha256-${createHash('sha256').update(text, 'utf8').digest('base64')}'`;

describe('report.html (static checks; the browser tests run it)', () => {
  it('allows only its own style and script, by hash, and loads nothing from anywhere', () => {
    const html = writeHtml(makeReport(manyFindings(20)));
    const csp = /<meta http-equiv="Content-Security-Policy" content="([^"]+)">/.exec(html)![1]!.replace(/&#39;/g, "'");
    expect(csp).toContain("default-src 'none'");
    expect(csp).toContain(`script-src ${hash(REPORT_SCRIPT)}`);
    expect(csp).toContain(`style-src ${hash(REPORT_STYLES)}`);
    expect(csp).not.toContain('unsafe');
    // The page's blocks are exactly the hashed texts.
    expect(html).toContain(`<style>${REPORT_STYLES}</style>`);
    expect(html).toContain(`<script>${REPORT_SCRIPT}</script>`);
    expect(html).not.toMatch(/\s(src|srcset|action|poster|background)=/i);
    expect(html).not.toMatch(/<(link|img|iframe|object|embed|base|form)\b/i);
    expect(html).not.toMatch(/\sstyle=/i);
  });

  it('keeps its own script free of what would end or bend a script block', () => {
    expect(REPORT_SCRIPT).not.toMatch(/<\/script|<!--/i);
    expect(REPORT_SCRIPT).not.toContain('innerHTML');
    expect(REPORT_SCRIPT).not.toContain('insertAdjacentHTML');
    expect(REPORT_SCRIPT).not.toMatch(/\beval\(|new Function/);
  });

  it('escapes data everywhere it lays it out', () => {
    const payload = '"><img src=x onerror=alert(1)><script>alert(2)</script>';
    const report = makeReport([finding({ predicate: `http://example.org/${payload}`, object: `"${payload}"` })], {
      inputs: [{ path: `data/${payload}.ttl`, format: 'turtle', bytes: 1, sha256: 'b'.repeat(64), statements: 1 }],
      options: { out: payload },
    });
    const html = writeHtml(report);
    const withoutData = html.replace(/<script type="application\/json" id="plumb-data">[\s\S]*?<\/script>/, '');
    expect(withoutData).not.toContain('<img');
    expect(withoutData).not.toContain('<script>alert');
    expect(withoutData).toContain('&lt;img src=x onerror=alert(1)&gt;');
    expect(escapeHtml(`<a href="x">'&`)).toBe('&lt;a href=&quot;x&quot;&gt;&#39;&amp;');
  });

  it('embeds the data so that nothing in it can close the block, and it still reads back the same', () => {
    const nasty = '</script><script>alert(1)</script><!-- & \u2028\u2029 </SCRIPT >';
    const text = embedJson({ s: nasty });
    expect(text).not.toMatch(/[<>&\u2028\u2029]/);
    expect(JSON.parse(text)).toEqual({ s: nasty });
    const html = writeHtml(makeReport([finding({ object: `"${nasty}"` })]));
    const block = /<script type="application\/json" id="plumb-data">([\s\S]*?)<\/script>/.exec(html)![1]!;
    expect((JSON.parse(block) as { findings: { o: string }[] }).findings[0]!.o).toBe(`"${nasty}"`);
  });

  it('links only http and https IRIs', () => {
    expect(safeHref('http://example.org/a b')).toBeUndefined();
    expect(safeHref('https://example.org/a?b=1#c')).toBe('https://example.org/a?b=1#c');
    for (const bad of ['javascript:alert(1)', 'JAVASCRIPT:alert(1)', ' javascript:alert(1)', 'data:text/html,x', 'vbscript:x', 'file:///etc/passwd', 'http:/x"onmouseover="x']) {
      expect(safeHref(bad)).toBeUndefined();
    }
  });

  it('is byte-identical for the same report', () => {
    expect(writeHtml(makeReport(manyFindings(200)))).toBe(writeHtml(makeReport(manyFindings(200))));
  });

  it('caps very long strings in the page (the full text stays in report.json)', () => {
    const big = `"${'x'.repeat(5 * 1024 * 1024)}"`;
    const html = writeHtml(makeReport([finding({ object: big })]));
    expect(html.length).toBeLessThan(200_000);
    expect(html).toContain('more characters');
  });
});

describe('the reason a report gives for having no trust figure', () => {
  const scored = (command: 'audit' | 'gate', calibrate: unknown, n = 10) => {
    const report = makeReport(manyFindings(3), { command });
    return noTrustReason({ ...report, summary: { ...report.summary, scored: n }, options: { ...report.options, calibrate } });
  };

  it('says the model did not run only when nothing was scored', () => {
    expect(scored('audit', 'auto', 0)).toContain('the model did not run');
    expect(scored('gate', false)).not.toContain('the model did not run');
  });

  it('tells a gate user where a trust figure comes from, and an audit user how to turn it on', () => {
    expect(scored('gate', false)).toContain('Run plumb audit');
    expect(scored('audit', false)).toContain('--calibrate');
    expect(scored('audit', true)).toContain('too few triples');
  });
});
