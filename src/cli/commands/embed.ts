/** `steadyfold embed <data> --method …`: one embedding to a CSV file. */
import { InputError } from '../../core/errors.js';
import type { MethodName, MethodParams, RunSpec } from '../../core/types.js';
import { checkAgainstRows, settingId, withDefaults } from '../../embed/methods.js';
import { embedOne } from '../../embed/run.js';
import { writeEmbeddingCsv } from '../../io/embedding-csv.js';
import { loadData, neighbours, preprocess } from '../../pipeline/prepare.js';
import { neighboursNeeded } from '../../config/plan.js';
import { sweepFromArgv } from './common.js';
import { defaultWorkers } from '../../pipeline/audit.js';

export async function run(argv: Record<string, unknown>): Promise<void> {
  const method = argv.method as MethodName;
  const cfg = await sweepFromArgv({ ...argv, perplexity: undefined, neighbors: undefined, 'min-dist': undefined, init: undefined, iterations: undefined });
  const given: MethodParams = {};
  if (method === 'tsne') {
    if (argv.perplexity !== undefined) given.perplexity = positive('perplexity', argv.perplexity);
    if (argv.init !== undefined) given.init = String(argv.init);
    if (argv.iterations !== undefined) given.iterations = Math.round(positive('iterations', argv.iterations));
  } else if (method === 'umap') {
    if (argv.neighbors !== undefined) given.nNeighbors = Math.round(positive('neighbors', argv.neighbors));
    if (argv['min-dist'] !== undefined) given.minDist = positive('min-dist', argv['min-dist'], true);
    if (argv.init !== undefined) given.init = String(argv.init);
  }
  const params = withDefaults(method, given);
  const seed = Number(argv.seed);
  if (!Number.isInteger(seed) || seed < 0) throw new InputError('flags.seed', `--seed: '${String(argv.seed)}' is not allowed; give a whole number ≥ 0`);
  const { dataset, warnings } = await loadData(String(argv.data), cfg.data);
  for (const w of warnings) process.stderr.write(`warning: ${w}\n`);
  const problem = checkAgainstRows(method, params, dataset.matrix.n);
  if (problem) throw new InputError('embed.too-few-rows', `${dataset.path}: ${problem}`);
  const threads = defaultWorkers();
  const prep = preprocess(dataset, warnings, cfg.data, threads);
  const id = settingId(method, params);
  const spec: RunSpec = { id: `${id}-s${seed}`, settingId: id, method, params, seed };
  const knn = neighbours(prep.X, neighboursNeeded([{ id, method, params, seeds: [seed] }], 1, prep.X.n), threads);
  const out = embedOne({ X: prep.X, knn, threads }, spec);
  await writeEmbeddingCsv(String(argv.out), out.embedding);
  const facts = Object.entries(out.info).map(([k, v]) => `${k} ${Number.isInteger(v) ? v : v.toFixed(4)}`).join(', ');
  if (argv.quiet !== true) process.stderr.write(`wrote ${argv.out} (${dataset.matrix.n} points, ${id}, seed ${seed}${facts ? `; ${facts}` : ''})\n`);
}

function positive(flag: string, v: unknown, allowZero = false): number {
  const x = Number(v);
  if (!Number.isFinite(x) || x < 0 || (!allowZero && x === 0)) {
    throw new InputError('flags.invalid', `--${flag}: '${String(v)}' is not allowed; give a number ${allowZero ? '≥ 0' : '> 0'}`);
  }
  return x;
}
