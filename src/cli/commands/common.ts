/** Pieces shared by the commands: reading the sweep, the data options, the progress sink. */
import { readFile } from 'node:fs/promises';
import { InputError } from '../../core/errors.js';
import { parseSweepFile, resolveSweep, type SweepConfig } from '../../config/sweep.js';
import { toOverrides } from '../options.js';
import { consoleProgress } from '../progress.js';
import type { ProgressSink } from '../../pipeline/progress.js';
import { defaultWorkers } from '../../pipeline/audit.js';

export async function sweepFromArgv(argv: Record<string, unknown>): Promise<SweepConfig> {
  let file = null;
  if (typeof argv.sweep === 'string') {
    let text: string;
    try {
      text = await readFile(argv.sweep, 'utf8');
    } catch {
      throw new InputError('sweep.missing-file', `${argv.sweep}: cannot read the sweep file; give the path of a YAML file such as sweeps/demo.yaml`);
    }
    file = parseSweepFile(argv.sweep, text);
  }
  return resolveSweep(file, toOverrides(argv));
}

export function workersFromArgv(argv: Record<string, unknown>): number {
  const w = argv.workers;
  if (w === undefined) return defaultWorkers();
  if (typeof w !== 'number' || !Number.isInteger(w) || w < 0 || w > 256) {
    throw new InputError('flags.workers', `--workers: '${String(w)}' is not allowed; give a whole number from 0 (main thread only) to 256`);
  }
  return w;
}

export function progressFromArgv(argv: Record<string, unknown>): ProgressSink {
  return consoleProgress({ quiet: argv.quiet === true });
}

export function commandLine(): string {
  return ['steadyfold', ...process.argv.slice(2)].map((a) => (/^[\w./:=,-]+$/.test(a) ? a : JSON.stringify(a))).join(' ');
}
