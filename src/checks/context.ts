import type { Finding, SourceLocation } from '../findings.js';
import type { Graph } from '../graph/store.js';
import type { Schema } from '../schema/index.js';
import type { Check, CheckContext, CheckOptions, ReportInput } from './types.js';

/** Fills `{name}` placeholders from `data`; an unknown name stays as written, to show in tests. */
export function formatMessage(template: string, data: Record<string, string | number> = {}): string {
  return template.replace(/\{(\w+)\}/g, (whole, name: string) => (name in data ? String(data[name]) : whole));
}

export function tripleSource(graph: Graph, t: number): SourceLocation | undefined {
  const file = graph.provenance.files[graph.provenance.file[t] ?? -1];
  const line = graph.provenance.line[t];
  if (file === undefined || line === undefined || line === 0) return undefined;
  return { file, line };
}

export function createContext(check: Check, graph: Graph, schema: Schema, options: CheckOptions): CheckContext {
  const keys = graph.terms.allKeys();
  return {
    graph,
    schema,
    options,
    finding(input: ReportInput): Finding {
      const template = check.meta.messages[input.messageId];
      if (template === undefined) throw new Error(`check ${check.meta.id} has no message "${input.messageId}"`);
      const t = input.triple;
      const finding: Finding = {
        kind: 'violation',
        check: check.meta.id,
        severity: input.severity ?? check.meta.severity,
        subject: input.subject ?? (t === undefined ? '' : keys[graph.s[t]!]!),
        predicate: input.predicate ?? (t === undefined ? '' : keys[graph.p[t]!]!),
        object: input.object ?? (t === undefined ? '' : keys[graph.o[t]!]!),
        message: formatMessage(template, input.data),
        evidence: input.evidence ?? {},
      };
      if (t !== undefined) {
        const g = graph.g[t]!;
        if (g >= 0) finding.graph = keys[g]!;
        finding.triple = t;
      }
      const source = (t === undefined ? undefined : tripleSource(graph, t)) ?? input.source;
      if (source) finding.source = source;
      return finding;
    },
  };
}
