import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { expect, it } from 'vitest';
import { runChecks, type RunChecksOptions } from '../../src/checks/index.js';
import type { Finding, Severity } from '../../src/findings.js';
import type { Graph } from '../../src/graph/store.js';
import { loadSchema, type Schema } from '../../src/schema/index.js';
import { readGraph } from '../../src/sources/index.js';

export const EX = 'http://example.org/';
export const XSD = 'http://www.w3.org/2001/XMLSchema#';

/**
 * Prefixes on one line with no line break after them, so that line 1 of a test's text is line 1 of
 * the file: a template literal that opens with a line break starts its first statement on line 2.
 */
const PREFIXES =
  '@prefix ex: <http://example.org/> . @prefix rdf: <http://www.w3.org/1999/02/22-rdf-syntax-ns#> . ' +
  '@prefix rdfs: <http://www.w3.org/2000/01/rdf-schema#> . @prefix owl: <http://www.w3.org/2002/07/owl#> . ' +
  '@prefix xsd: <http://www.w3.org/2001/XMLSchema#> . @prefix sh: <http://www.w3.org/ns/shacl#> . ';

const dir = mkdtempSync(join(tmpdir(), 'plumb-checks-'));
let counter = 0;

/** Writes Turtle (with the usual prefixes) to a temporary file named `name` and reads it with plumb's reader. */
export async function turtle(text: string, name = 'data.ttl'): Promise<Graph> {
  const path = join(dir, `${counter++}-${name}`);
  writeFileSync(path, PREFIXES + text);
  const { graph, rejections } = await readGraph([path], { strict: true });
  expect(rejections).toEqual([]);
  return graph;
}

export interface Case {
  name: string;
  data: string;
  /** Ontology given as a separate --schema file. */
  schema?: string;
  shapes?: string;
  options?: RunChecksOptions;
}

/** What an expected finding must match; terms written `ex:x` stand for `http://example.org/x`. */
export interface Expected {
  severity?: Severity;
  subject?: string;
  predicate?: string;
  object?: string;
  /** Line in the data text (1 = the line the template literal opens on). */
  line?: number;
  message?: RegExp;
  evidence?: Record<string, unknown>;
}

export interface InvalidCase extends Case {
  expect: Expected[];
}

export function expand(term: string): string {
  return term.startsWith('ex:') ? EX + term.slice(3) : term.startsWith('xsd:') ? XSD + term.slice(4) : term;
}

export async function load(c: Omit<Case, 'name'>): Promise<{ graph: Graph; schema: Schema }> {
  const graph = await turtle(c.data);
  const schemaGraphs = c.schema === undefined ? [] : [await turtle(c.schema, 'schema.ttl')];
  const shapesGraphs = c.shapes === undefined ? [] : [await turtle(c.shapes, 'shapes.ttl')];
  return { graph, schema: loadSchema(graph, schemaGraphs, shapesGraphs) };
}

/** The findings of one check on a case. */
export async function findingsOf(check: string, c: Omit<Case, 'name'>): Promise<Finding[]> {
  const { graph, schema } = await load(c);
  return runChecks(graph, schema, { ...c.options, only: [check] });
}

export function matches(f: Finding, e: Expected): boolean {
  if (e.severity !== undefined && f.severity !== e.severity) return false;
  if (e.subject !== undefined && f.subject !== expand(e.subject)) return false;
  if (e.predicate !== undefined && f.predicate !== expand(e.predicate)) return false;
  if (e.object !== undefined && f.object !== expand(e.object)) return false;
  if (e.line !== undefined && f.source?.line !== e.line) return false;
  if (e.message !== undefined && !e.message.test(f.message)) return false;
  if (e.evidence !== undefined) {
    try {
      expect(f.evidence).toMatchObject(e.evidence);
    } catch {
      return false;
    }
  }
  return true;
}

/** Valid cases give no finding of the check; invalid ones give exactly the expected findings, in any order. */
export function runCases(check: string, cases: { valid: Case[]; invalid: InvalidCase[] }): void {
  for (const c of cases.valid) {
    it(`valid: ${c.name}`, async () => {
      const found = await findingsOf(check, c);
      expect(found.map((f) => f.message)).toEqual([]);
    });
  }
  for (const c of cases.invalid) {
    it(`invalid: ${c.name}`, async () => {
      const found = await findingsOf(check, c);
      const unmatched = [...found];
      for (const e of c.expect) {
        const i = unmatched.findIndex((f) => matches(f, e));
        expect(i, `no finding matches ${JSON.stringify(e, (_, v: unknown) => (v instanceof RegExp ? String(v) : v))} among ${JSON.stringify(found.map((f) => [f.severity, f.subject, f.object, f.source?.line, f.message]), null, 1)}`).toBeGreaterThanOrEqual(0);
        unmatched.splice(i, 1);
      }
      expect(unmatched.map((f) => f.message)).toEqual([]);
      for (const f of found) {
        expect(f.kind).toBe('violation');
        expect(f.check).toBe(check);
      }
    });
  }
}

/** Matches the `file:line` evidence gives for a temporary file whose name ends in `name`. */
export function atLine(line: number, name = 'data.ttl'): unknown {
  return expect.stringMatching(new RegExp(`${name.replace('.', '\\.')}:${line}$`));
}
