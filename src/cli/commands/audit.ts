/** `steadyfold audit <data>`: the whole sweep, scored, ranked and reported. */
import path from 'node:path';
import { runAudit } from '../../pipeline/audit.js';
import { writeAuditOutputs } from '../../io/write-audit.js';
import { buildReport } from '../../report/index.js';
import { commandLine, progressFromArgv, sweepFromArgv, workersFromArgv } from './common.js';

export async function run(argv: Record<string, unknown>): Promise<void> {
  const dataPath = String(argv.data);
  const sweep = await sweepFromArgv(argv);
  const workers = workersFromArgv(argv);
  const outDir = typeof argv.out === 'string' ? argv.out : path.join('reports', path.basename(dataPath).replace(/\.[^.]*$/, ''));
  const progress = progressFromArgv(argv);
  const t0 = performance.now();
  try {
    const out = await runAudit({ dataPath, sweep, workers, command: commandLine(), created: new Date().toISOString() }, progress);
    progress.stage('report', 1);
    const report = buildReport({ results: out.results, embeddings: out.embeddings, points: out.points });
    await writeAuditOutputs(outDir, out.results, out.embeddings, report, out.points);
    progress.tick(1);
    progress.end();
    const secs = ((performance.now() - t0) / 1000).toFixed(1);
    const failed = out.results.runs.filter((r) => r.status === 'failed').length;
    process.stdout.write(
      `${out.results.runs.length} runs in ${secs} s${failed ? ` (${failed} failed)` : ''}\n` +
        `report: ${path.join(outDir, 'report.html')}\n` +
        `markdown: ${path.join(outDir, 'report.md')}\n` +
        `results: ${path.join(outDir, 'results.json')}\n`,
    );
  } finally {
    progress.end();
  }
}
