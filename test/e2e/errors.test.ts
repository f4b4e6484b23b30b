import { describe, expect, it } from 'vitest';
import { cli, tempDir, writeTemp } from './helpers.js';

/** Errors for people: one line on stderr, exit code 2, no stack unless --debug. */
function expectUserError(r: { status: number | null; stderr: string }, pattern: RegExp): void {
  expect(r.status).toBe(2);
  const lines = r.stderr.trim().split('\n');
  expect(lines).toHaveLength(1);
  expect(lines[0]).toMatch(pattern);
  expect(r.stderr).not.toMatch(/\n\s+at /);
}

describe('command-line errors', () => {
  const dir = tempDir();
  const good = writeTemp(dir, 'good.csv', 'a,b,c,lab\n' + Array.from({ length: 40 }, (_, i) => `${i % 7},${(i * 3) % 11},${(i * 5) % 13},${i % 2 ? 'x' : 'y'}`).join('\n') + '\n');

  it('names a missing data file', () => {
    expectUserError(cli(['audit', `${dir}/nope.csv`]), /nope\.csv/);
  });

  it('names file, line and column of a non-numeric cell', () => {
    const bad = writeTemp(dir, 'bad.csv', 'a,b\n1,2\n3,oops\n');
    expectUserError(cli(['plan', bad]), /bad\.csv:3:2/);
  });

  it('says which setting needs more rows and what the limit is', () => {
    expectUserError(cli(['plan', good, '--label', 'lab', '--methods', 'tsne', '--perplexity', '30']), /perplexity 30 .*perplexity < \(n − 1\)\/3 = 13/);
  });

  it('rejects an unknown flag value with the flag name', () => {
    expectUserError(cli(['plan', good, '--perplexity', '5,x']), /^steadyfold: --perplexity: 'x' is not a number/);
  });

  it('rejects an unknown option', () => {
    expectUserError(cli(['audit', good, '--perplexty', '5']), /Unknown argument/i);
  });

  it('prints a stack trace only with --debug', () => {
    const r = cli(['plan', `${dir}/nope.csv`, '--debug']);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/\n\s+at /);
  });

  it('lists the commands and exit codes in --help', () => {
    const r = cli(['--help']);
    expect(r.status).toBe(0);
    for (const c of ['audit', 'plan', 'embed', 'score', 'report']) expect(r.stdout).toContain(c);
    expect(r.stdout).toContain('Exit codes');
  });
});
