/** `steadyfold report <dir>`: rebuild the report files from results.json and the saved embeddings. */
import { readResultsDir, writeReportFiles } from '../../io/write-audit.js';
import { buildReport } from '../../report/index.js';

export async function run(argv: Record<string, unknown>): Promise<void> {
  const dir = String(argv.dir);
  const { results, embeddings, points } = await readResultsDir(dir);
  await writeReportFiles(dir, buildReport({ results, embeddings, points }));
  if (argv.quiet !== true) process.stdout.write(`report: ${dir}/report.html\n`);
}
