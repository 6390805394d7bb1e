/**
 * Audit benchmark: the whole `plumb audit` pipeline on the WordNet 3.0 graph (fixtures/wordnet) with
 * 5% `random` and 5% `range` errors added, with the default folds. Prints the time of each phase
 * (reading, checks, fitting, scoring, explaining) and the detection table of the audit's ranking
 * against the planted errors, beside the degree heuristic and random order on the same graph.
 *
 * Goal: an audit of a ~300k-triple graph inside 30 minutes on a 2-core machine with out-of-fold
 * scoring on. The default graph has ~235k triples, ~259k with the planted errors.
 *
 * Environment: PLUMB_BENCH_WORDNET_MAX (keep at most this many triples, a fixed sample; default all),
 * PLUMB_BENCH_FOLDS (default: the audit's), PLUMB_BENCH_EPOCHS (default: the model's),
 * PLUMB_BENCH_BUDGET (seconds for all fits; default none).
 */
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { buildWordNetTriples } from '../../fixtures/wordnet/build.js';
import { AUDIT_DEFAULTS, auditDetailed } from '../../src/audit.js';
import { evaluateRanking, formatComparison, type ComparisonRow, type RankedTriple } from '../../src/evaluation/compare.js';
import { corruptGraph, nQuadsLines, parseTruth, truthText } from '../../src/evaluation/corrupt.js';
import { detectionTable } from '../../src/evaluation/detection.js';
import { graphFromKeys } from '../../src/graph/store.js';
import { degreeHeuristic, randomOrder } from '../../src/scoring/baselines.js';
import { scorableTriples } from '../../src/scoring/crossfit.js';

const env = process.env;

export async function run(): Promise<void> {
  const max = env.PLUMB_BENCH_WORDNET_MAX ? Number(env.PLUMB_BENCH_WORDNET_MAX) : undefined;
  const triples = await buildWordNetTriples(max === undefined ? {} : { maxTriples: max });
  const base = graphFromKeys(triples);
  const planted = corruptGraph(base, { rate: 0.1, kinds: ['random', 'range'], seed: 1 });
  const dir = await mkdtemp(join(tmpdir(), 'plumb-bench-audit-'));
  try {
    const file = join(dir, 'wordnet-corrupted.nt');
    await writeFile(file, [...nQuadsLines(planted.graph)].join(''));
    const truth = parseTruth(truthText(planted.graph, planted.injected), 'truth.tsv');
    console.log(`WordNet 3.0: ${base.size.toLocaleString('en-US')} triples, ${planted.injected.length.toLocaleString('en-US')} errors added (5% random, 5% range)`);

    const model = env.PLUMB_BENCH_EPOCHS ? { epochs: Number(env.PLUMB_BENCH_EPOCHS) } : undefined;
    const started = performance.now();
    const auditRun = await auditDetailed([file], {
      folds: env.PLUMB_BENCH_FOLDS ? Number(env.PLUMB_BENCH_FOLDS) : AUDIT_DEFAULTS.folds,
      calibrate: false,
      ...(model ? { model } : {}),
      ...(env.PLUMB_BENCH_BUDGET ? { maxSeconds: Number(env.PLUMB_BENCH_BUDGET) } : {}),
      progress: (e) => {
        if (e.phase === 'folds' || (e.phase === 'checks' && e.done === e.total)) console.log(`  ${e.phase} ${e.done}/${e.total ?? '?'} ${e.detail ?? ''} at ${((performance.now() - started) / 1000).toFixed(0)} s`);
      },
    });
    const wall = (performance.now() - started) / 1000;
    const { report, scores, graph } = auditRun;
    const d = report.durations;
    console.log(`audit: ${wall.toFixed(0)} s wall; read ${d.read?.toFixed(1)} s, checks ${d.checks?.toFixed(1)} s, fit ${d.fit?.toFixed(1)} s, score ${d.score?.toFixed(1)} s, explain ${d.explain?.toFixed(1)} s`);
    console.log(`folds ${report.folds}, backend ${report.backend}, basis ${String(report.options.basis)}, ${report.summary.scored.toLocaleString('en-US')} triples scored, ${report.summary.findings} findings`);

    // The audit's ranking against the planted errors, then two baselines on the same scored triples.
    const keys = graph.terms;
    const ranking: RankedTriple[] = Array.from(scores!.triples, (t, j) => ({
      order: scores!.order[j]!,
      key: `${keys.key(graph.s[t]!)}\t${keys.key(graph.p[t]!)}\t${keys.key(graph.o[t]!)}`,
      plausibility: scores!.plausibility[j]!,
    }));
    const audit = evaluateRanking(ranking, truth);
    const scorable = scorableTriples(graph);
    const idx = Array.from(graph.s.keys()).filter((i) => scorable[i]);
    const truthKeys = new Map(truth.map((t) => [`${t.subject}\t${t.predicate}\t${t.object}`, t.kind]));
    const kindOf = idx.map((i) => truthKeys.get(`${keys.key(graph.s[i]!)}\t${keys.key(graph.p[i]!)}\t${keys.key(graph.o[i]!)}`) ?? null);
    const degree = degreeHeuristic(graph);
    const random = randomOrder(graph, 1);
    const rows: ComparisonRow[] = [
      { method: 'random', title: 'random order', seconds: 0, table: detectionTable(idx.map((i) => random[i]!), kindOf) },
      { method: 'degree', title: 'degree heuristic', seconds: 0, table: detectionTable(idx.map((i) => degree[i]!), kindOf) },
      { method: 'rgcn', title: 'plumb audit (R-GCN out-of-fold)', seconds: wall, table: audit.table },
    ];
    console.log(formatComparison(rows));
    if (audit.unranked > 0) console.log(`${audit.unranked} planted triples were not ranked`);
  } finally {
    await rm(dir, { recursive: true, force: true });
  }
}
