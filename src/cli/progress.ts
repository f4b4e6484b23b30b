/**
 * Progress on stderr. On a terminal: one redrawn line with the stage, a bar,
 * counts and an ETA. Off a terminal (logs, CI): plain lines, at most one per
 * few seconds per stage plus the stage's start and end, no control codes.
 */
import type { ProgressSink } from '../pipeline/progress.js';

export interface ProgressOptions {
  quiet: boolean;
  stream?: NodeJS.WriteStream;
  /** Force the plain-line mode (tests). */
  plain?: boolean;
  now?: () => number;
}

export function consoleProgress(opts: ProgressOptions): ProgressSink {
  const stream = opts.stream ?? process.stderr;
  const tty = !opts.plain && stream.isTTY === true;
  const now = opts.now ?? (() => performance.now());
  let stage = '';
  let total = 0;
  let started = 0;
  let estimate: number | undefined;
  let lastLine = 0;
  let drawn = false;

  const clear = (): void => {
    if (tty && drawn) {
      stream.write('\r\x1b[2K');
      drawn = false;
    }
  };
  const eta = (done: number, fraction?: number): string => {
    const elapsed = (now() - started) / 1000;
    let left: number | null = null;
    if (fraction !== undefined && fraction > 0 && done < total) left = (elapsed * (1 - fraction)) / fraction;
    else if (done > 0 && done < total) left = (elapsed / done) * (total - done);
    else if (done === 0 && estimate !== undefined) left = estimate;
    return `${fmtTime(elapsed)} elapsed${left !== null && done < total ? `, about ${fmtTime(left)} left` : ''}`;
  };

  return {
    stage(name, t, est) {
      if (opts.quiet) return;
      clear();
      stage = name;
      total = t;
      started = now();
      estimate = est;
      lastLine = 0;
      // Single-step stages say nothing until they finish, so a quick failure prints only its error.
      if (!tty && total > 1) stream.write(`${name}: started (${total} to do${est !== undefined ? `, estimate ${fmtTime(est)}` : ''})\n`);
    },
    tick(done, note, fraction) {
      if (opts.quiet) return;
      if (tty) {
        const width = 24;
        const filled = total > 0 ? Math.round((width * done) / total) : width;
        stream.write(`\r\x1b[2K${stage} [${'#'.repeat(filled)}${'.'.repeat(width - filled)}] ${done}/${total} ${eta(done, fraction)}${note ? `  ${note}` : ''}`);
        drawn = true;
        if (done >= total) {
          stream.write('\n');
          drawn = false;
        }
        return;
      }
      const t = now();
      if (done >= total || t - lastLine > 5000) {
        lastLine = t;
        stream.write(`${stage}: ${done}/${total}${note ? ` (${note})` : ''}, ${eta(done, fraction)}\n`);
      }
    },
    warn(message) {
      clear();
      stream.write(`warning: ${message}\n`);
    },
    info(message) {
      if (opts.quiet) return;
      clear();
      stream.write(`${message}\n`);
    },
    end() {
      clear();
    },
  };
}

export function fmtTime(seconds: number): string {
  if (!Number.isFinite(seconds)) return '?';
  if (seconds < 9.95) return `${seconds.toFixed(1)} s`;
  const whole = Math.round(seconds);
  if (whole < 60) return `${whole} s`;
  // Round first, then split, so 119.6 s reads "2 min 0 s", never "1 min 60 s".
  const m = Math.floor(whole / 60);
  return `${m} min ${whole - 60 * m} s`;
}
