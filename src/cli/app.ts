/**
 * steadyfold command line. Parsing and the mapping of errors to exit codes
 * live here; each command is a file under commands/ and is imported lazily.
 *
 * Exit codes: 0 success · 1 internal error (a bug) · 2 bad input or usage.
 */
import yargs, { type Argv } from 'yargs';
import { InputError } from '../core/errors.js';
import { VERSION } from '../core/version.js';
import { COMMON_FLAGS, DATA_FLAGS, SCORE_DATA_FLAGS, SWEEP_FLAGS } from './options.js';

export const EXIT = { ok: 0, internal: 1, input: 2 } as const;

/** Exit codes with a reason, as listed in `--help`. */
const EPILOG = 'Exit codes: 0 success, 1 internal error (please report it), 2 bad input or usage.';

type Handler = (argv: Record<string, unknown>) => Promise<void>;

function lazy(load: () => Promise<{ run: Handler }>): (argv: Record<string, unknown>) => Promise<void> {
  return async (argv) => {
    const mod = await load();
    await mod.run(argv);
  };
}

export function buildParser(args: string[]): Argv {
  return yargs(args)
    .scriptName('steadyfold')
    .usage('$0 <command> [options]\n\nAudit 2-D embeddings (t-SNE, UMAP, PCA) for faithfulness to the data and stability across seeds.')
    .command(
      'audit <data>',
      'run the sweep (settings × seeds), score every map, rank the settings and write the report',
      (y) => y.positional('data', { type: 'string', describe: 'CSV/TSV file with a header row' }).options({ ...DATA_FLAGS, ...SWEEP_FLAGS, out: { type: 'string', describe: 'output folder (default reports/<data name>)' }, ...COMMON_FLAGS }),
      lazy(() => import('./commands/audit.js')),
    )
    .command(
      'plan <data>',
      'print the runs a sweep would make and an estimated time, without computing embeddings',
      (y) => y.positional('data', { type: 'string' }).options({ ...DATA_FLAGS, ...SWEEP_FLAGS, ...COMMON_FLAGS }),
      lazy(() => import('./commands/plan.js')),
    )
    .command(
      'embed <data>',
      'make one embedding and write it as CSV (header x,y; rows in input order)',
      (y) =>
        y.positional('data', { type: 'string' }).options({
          ...DATA_FLAGS,
          method: { type: 'string', choices: ['tsne', 'umap', 'pca'], demandOption: true, describe: 'embedding method' },
          perplexity: { type: 'number', describe: 't-SNE perplexity (default 30)' },
          init: { type: 'string', choices: ['pca', 'random', 'spectral'], describe: 'initialisation: spectral, pca or random (default: pca for t-SNE, spectral for UMAP)' },
          iterations: { type: 'number', describe: 't-SNE iterations (default 1000)' },
          neighbors: { type: 'number', describe: 'UMAP neighbour count (default 15)' },
          'min-dist': { type: 'number', describe: 'UMAP minimum distance (default 0.1)' },
          seed: { type: 'number', default: 1, describe: 'random seed' },
          out: { type: 'string', demandOption: true, describe: 'output CSV file' },
          ...COMMON_FLAGS,
        }),
      lazy(() => import('./commands/embed.js')),
    )
    .command(
      'score <data> <embedding>',
      'score an embedding made anywhere (rows in the data file’s order)',
      (y) =>
        y
          .positional('data', { type: 'string' })
          .positional('embedding', { type: 'string', describe: 'CSV with columns x,y' })
          .options({
            ...SCORE_DATA_FLAGS,
            k: { type: 'number', default: 15, describe: 'neighbourhood size' },
            against: { type: 'string', describe: 'a second embedding of the same rows: adds procrustes_disparity and knn_overlap_between' },
            json: { type: 'boolean', describe: 'print JSON instead of a table' },
            ...COMMON_FLAGS,
          }),
      lazy(() => import('./commands/score.js')),
    )
    .command(
      'report <dir>',
      'rebuild report.html, report.md and figures from results.json in <dir>',
      (y) => y.positional('dir', { type: 'string' }).options({ ...COMMON_FLAGS }),
      lazy(() => import('./commands/report.js')),
    )
    .demandCommand(1, 'give a command: audit, plan, embed, score or report')
    .strict()
    .version(VERSION)
    .help()
    .epilog(EPILOG)
    .wrap(Math.min(110, process.stdout.columns || 100))
    .fail((msg, err) => {
      if (err) throw err;
      throw new InputError('usage', `${msg}; see 'steadyfold --help'`);
    });
}

export async function main(args: string[]): Promise<number> {
  const debug = args.includes('--debug');
  try {
    await buildParser(args).parseAsync();
    return EXIT.ok;
  } catch (e) {
    if (e instanceof InputError) {
      process.stderr.write(`steadyfold: ${e.message}\n`);
      if (debug && e.stack) process.stderr.write(`${e.stack}\n`);
      return EXIT.input;
    }
    const err = e instanceof Error ? e : new Error(String(e));
    process.stderr.write(`steadyfold: internal error: ${err.message.split('\n')[0]}${debug ? '' : ' (run again with --debug for details)'}\n`);
    if (debug && err.stack) process.stderr.write(`${err.stack}\n`);
    return EXIT.internal;
  }
}
