import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { check } from '../../src/checks/run.js';
import { decideGate } from '../../src/gate.js';
import { REPORT_FORMATS, writeReports } from '../../src/report/index.js';
import { validateReport } from '../../src/report/json.js';

/** The writers on a report the real check pipeline made, not a synthetic one. */
describe('reports of a real plumb check run', () => {
  it('validate against the schema and write in every format', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'plumb-pipeline-'));
    const graph = join(dir, 'orchard.ttl');
    writeFileSync(
      graph,
      [
        '@prefix ex: <http://example.org/orchard/> .',
        '@prefix rdfs: <http://www.w3.org/2000/01/rdf-schema#> .',
        'ex:plantedIn rdfs:domain ex:Tree ; rdfs:range ex:Plot .',
        'ex:t1 a ex:Tree ; ex:plantedIn ex:p1 .',
        'ex:p1 a ex:Plot .',
        'ex:p2 a ex:Tree .',
        'ex:t2 a ex:Tree ; ex:plantedIn ex:p2 .',
        'ex:t3 ex:plantedIn "not a plot" .',
        'this line is not turtle',
      ].join('\n'),
    );
    const report = await check([graph]);
    expect(validateReport(report)).toEqual([]);
    // The range violation, the domain violation and the unreadable line are all there.
    expect(new Set(report.findings.map((f) => f.kind))).toEqual(new Set(['syntax', 'violation']));
    const written = await writeReports(report, join(dir, 'out'), REPORT_FORMATS);
    expect(validateReport(JSON.parse(readFileSync(written[0]!, 'utf8')))).toEqual([]);
    const gated = decideGate(report.findings, [], {}, new Date('2024-06-01T00:00:00Z'));
    const errors = report.findings.filter((f) => f.severity === 'error').length;
    expect(gated.exitCode).toBe(errors > 0 ? 1 : 0);
  });
});
