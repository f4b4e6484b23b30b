import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

export const ROOT = fileURLToPath(new URL('../..', import.meta.url));
export const CLI = path.join(ROOT, 'dist/src/cli/main.js');

export interface CliResult {
  status: number | null;
  stdout: string;
  stderr: string;
}

/** Run the built command line (npm test builds first). */
export function cli(args: string[], cwd = ROOT): CliResult {
  const r = spawnSync(process.execPath, [CLI, ...args], { cwd, encoding: 'utf8', env: { ...process.env, NO_COLOR: '1' } });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

export function tempDir(prefix = 'steadyfold-'): string {
  return mkdtempSync(path.join(os.tmpdir(), prefix));
}

export function writeTemp(dir: string, name: string, text: string): string {
  const p = path.join(dir, name);
  writeFileSync(p, text);
  return p;
}
