/** `steadyfold plan <data>`: the runs a sweep would make and how long they should take. */
import { InputError } from '../../core/errors.js';
import { DEFAULTS } from '../../config/sweep.js';
import { estimateRunSeconds, estimateSweepSeconds, expandGrid, neighboursNeeded, rowLimitProblems } from '../../config/plan.js';
import { paramsForFile } from '../../embed/methods.js';
import { loadData } from '../../pipeline/prepare.js';
import { fmtTime } from '../progress.js';
import { sweepFromArgv, workersFromArgv } from './common.js';

export async function run(argv: Record<string, unknown>): Promise<void> {
  const sweep = await sweepFromArgv(argv);
  const workers = workersFromArgv(argv);
  const { dataset, warnings } = await loadData(String(argv.data), sweep.data);
  const n = dataset.matrix.n;
  const dIn = dataset.matrix.d;
  const dims = sweep.data.pcaDims === 'auto' ? Math.min(dIn, DEFAULTS.pcaDimsAuto) : sweep.data.pcaDims ?? dIn;
  const { settings, runs } = expandGrid(sweep);
  const problems = rowLimitProblems(settings, n, sweep.k);
  if (problems.length > 0) throw new InputError('sweep.too-few-rows', `${dataset.path}: ${n} rows are too few for ${problems[0]}`);
  const kMax = neighboursNeeded(settings, sweep.k, n);
  const est = estimateSweepSeconds(runs, n, dims, Math.max(1, workers), kMax, dIn);
  const lines: string[] = [];
  for (const w of warnings) lines.push(`warning: ${w}`);
  lines.push(`data: ${dataset.path} — ${n} rows × ${dIn} columns${dims !== dIn ? `, PCA to ${dims}` : ''}${sweep.data.scale ? ', z-scored' : ''}`);
  lines.push(`settings: ${settings.length}, runs: ${runs.length}, seeds: ${sweep.seeds.join(',')}, k = ${sweep.k}, workers: ${workers}`);
  lines.push('');
  lines.push(pad('setting', 28) + pad('method', 7) + pad('parameters', 34) + pad('runs', 6) + 'est. per run');
  for (const s of settings) {
    const params = Object.entries(paramsForFile(s.method, s.params)).map(([k, v]) => `${k}=${v}`).join(' ');
    lines.push(pad(s.id, 28) + pad(s.method, 7) + pad(params || '—', 34) + pad(String(s.seeds.length), 6) + fmtTime(estimateRunSeconds(s.method, s.params, n)));
  }
  lines.push('');
  lines.push(
    `estimated time: ${fmtTime(est.total)} (neighbours ${fmtTime(est.neighbours)}, scoring index ${fmtTime(est.scoringIndex)}, ` +
      `runs ${fmtTime(est.runs)} on ${Math.max(1, workers)} worker${workers === 1 ? '' : 's'}, stability ${fmtTime(est.stability)})`,
  );
  process.stdout.write(lines.join('\n') + '\n');
}

function pad(s: string, w: number): string {
  return s.length >= w ? s + ' ' : s + ' '.repeat(w - s.length);
}
