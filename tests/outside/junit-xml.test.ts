import { describe, expect, it } from 'vitest';
import { SaxesParser } from '@rubensworks/saxes';
import { writeJunit, xmlText } from '../../src/report/junit.js';
import { finding, makeReport, manyFindings } from '../report/make-report.js';

/**
 * junit.xml must be well-formed XML 1.0 (W3C XML 1.0 Fifth Edition; checked with saxes, a strict
 * non-validating XML parser) and follow the element layout CI systems read:
 * testsuites > testsuite > testcase > failure, with tests/failures counts on the suites. No standard
 * body publishes that layout (common practice, as Ant's and Maven Surefire's reports write it).
 */

interface Node {
  name: string;
  attributes: Record<string, string>;
  children: Node[];
  text: string;
}

/** Parses with a strict XML parser; throws on the first well-formedness error. */
function parseXml(xml: string): Node {
  const parser = new SaxesParser({ xmlns: false });
  const stack: Node[] = [];
  let root: Node | undefined;
  parser.on('error', (error) => {
    throw error;
  });
  parser.on('opentag', (tag) => {
    const node: Node = { name: tag.name, attributes: tag.attributes as Record<string, string>, children: [], text: '' };
    if (stack.length > 0) stack[stack.length - 1]!.children.push(node);
    else root = node;
    stack.push(node);
  });
  parser.on('text', (text) => {
    if (stack.length > 0) stack[stack.length - 1]!.text += text;
  });
  parser.on('closetag', () => {
    stack.pop();
  });
  parser.write(xml).close();
  if (!root) throw new Error('no root element');
  return root;
}

const HOSTILE = [
  '"]]><script>alert(1)</script>&amp;\'"',
  'nul\u0000 bell\u0007 vt\u000b ff\u000c',
  'lone \ud800 high, \udc00 low, \ufffe \uffff',
  'emoji 🍎 and e\u0301 and עברית',
].join(' | ');

describe('junit.xml (common practice layout, XML 1.0 well-formed)', () => {
  it('is well-formed even when terms, messages and file names hold markup and characters XML forbids', () => {
    const report = makeReport([
      finding({ object: `"${HOSTILE}"@he`, message: HOSTILE, source: { file: `data/${HOSTILE}.ttl`, line: 3 } }),
      finding({ predicate: `http://example.org/orchard/${HOSTILE}`, check: `check ${HOSTILE}` }),
    ]);
    const xml = writeJunit(report);
    const root = parseXml(xml);
    expect(root.name).toBe('testsuites');
    const failure = root.children.flatMap((s) => s.children).flatMap((c) => c.children).find((n) => n.name === 'failure');
    expect(failure).toBeDefined();
    // The text comes back as written, less the characters XML 1.0 forbids (§2.2 Char).
    expect(failure!.text).toContain('"]]><script>alert(1)</script>&amp;\'"');
    expect(failure!.text).toContain('emoji 🍎 and e\u0301 and עברית');
    expect(failure!.text).not.toMatch(/[\u0000\u0007\u000b\u000c\ufffe\uffff]|[\ud800-\udfff](?![\udc00-\udfff])/u);
    expect(xmlText('a\u0000b\ud800c🍎')).toBe('ab' + 'c🍎');
  });

  it('has testsuites > testsuite > testcase > failure, one case per check and per predicate, with consistent counts', () => {
    const findings = manyFindings(300);
    const report = makeReport(findings);
    report.checks = [...(report.checks ?? []), { id: 'disjoint', title: 'No resource has two disjoint classes', severity: 'error' }];
    const root = parseXml(writeJunit(report, { failOn: 'warning' }));
    expect(root.name).toBe('testsuites');
    expect(root.children.map((s) => s.name)).toEqual(['testsuite', 'testsuite']);
    const [checks, predicates] = root.children as [Node, Node];
    for (const suite of root.children) {
      expect(suite.children.every((c) => c.name === 'testcase')).toBe(true);
      for (const c of suite.children) expect(c.children.every((f) => f.name === 'failure')).toBe(true);
      expect(Number(suite.attributes.tests)).toBe(suite.children.length);
      expect(Number(suite.attributes.failures)).toBe(suite.children.filter((c) => c.children.length > 0).length);
    }
    expect(Number(root.attributes.tests)).toBe(checks.children.length + predicates.children.length);
    const checkIds = new Set([...findings.map((f) => f.check), ...(report.checks ?? []).map((c) => c.id)]);
    expect(checks.children.map((c) => c.attributes.name).sort()).toEqual([...checkIds].sort());
    const preds = new Set(findings.map((f) => `<${f.predicate}>`));
    expect(new Set(predicates.children.map((c) => c.attributes.name))).toEqual(preds);
    // `disjoint` ran and found nothing: a passing case.
    const disjoint = checks.children.find((c) => c.attributes.name === 'disjoint')!;
    expect(disjoint.children).toEqual([]);
  });

  it('fails a case only for findings at or above the failing severity', () => {
    const report = makeReport([
      finding({ check: 'range', severity: 'error' }),
      finding({ check: 'model', kind: 'suspect', severity: 'warning', predicate: 'http://example.org/orchard/variety' }),
      finding({ check: 'datatype', severity: 'note', predicate: 'http://example.org/orchard/yieldKg' }),
    ]);
    const failed = (failOn: 'error' | 'warning' | 'note'): string[] =>
      parseXml(writeJunit(report, { failOn }))
        .children[0]!.children.filter((c) => c.children.length > 0)
        .map((c) => c.attributes.name!)
        .sort();
    expect(failed('error')).toEqual(['range']);
    expect(failed('warning')).toEqual(['model', 'range']);
    expect(failed('note')).toEqual(['datatype', 'model', 'range']);
    const failure = parseXml(writeJunit(report)).children[0]!.children.find((c) => c.attributes.name === 'range')!.children[0]!;
    expect(failure.attributes.type).toBe('error');
    expect(failure.attributes.message).toBe('1 finding at or above error');
    expect(failure.text).toContain('orchard.ttl:12:3');
  });

  it('is byte-identical for the same report', () => {
    expect(writeJunit(makeReport(manyFindings(100)))).toBe(writeJunit(makeReport(manyFindings(100))));
  });
});
