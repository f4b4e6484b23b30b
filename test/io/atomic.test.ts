import { mkdir, mkdtemp, readFile, readdir, rm, stat, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { InputError } from '../../src/core/errors.js';
import { ensureDir, writeFileAtomic } from '../../src/io/atomic.js';

let dir: string;

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'steadyfold-atomic-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('writeFileAtomic', () => {
  it('writes text as UTF-8 and creates missing parent folders', async () => {
    const path = join(dir, 'deep', 'er', 'note.txt');
    await writeFileAtomic(path, 'héllo\n');
    expect(await readFile(path, 'utf8')).toBe('héllo\n');
  });

  it('writes bytes unchanged', async () => {
    const path = join(dir, 'bytes.bin');
    const data = Uint8Array.from([0, 255, 10, 13, 128]);
    await writeFileAtomic(path, data);
    expect(new Uint8Array(await readFile(path))).toEqual(data);
  });

  it('replaces an existing file and leaves no temporary file behind', async () => {
    const sub = join(dir, 'replace');
    const path = join(sub, 'out.csv');
    await writeFileAtomic(path, 'old');
    await writeFileAtomic(path, 'new');
    expect(await readFile(path, 'utf8')).toBe('new');
    expect(await readdir(sub)).toEqual(['out.csv']);
  });

  it('keeps every one of many concurrent writes to different files whole', async () => {
    const sub = join(dir, 'many');
    const names = Array.from({ length: 40 }, (_, i) => `f${i}.txt`);
    await Promise.all(names.map((n, i) => writeFileAtomic(join(sub, n), 'x'.repeat(1000 + i))));
    expect((await readdir(sub)).sort()).toEqual(names.slice().sort());
    for (let i = 0; i < names.length; i++) expect((await stat(join(sub, names[i]))).size).toBe(1000 + i);
  });

  it('fails with io.write-failed on a directory path and leaves the folder untouched', async () => {
    const sub = join(dir, 'isdir');
    await mkdir(join(sub, 'target'), { recursive: true });
    await expect(writeFileAtomic(join(sub, 'target'), 'x')).rejects.toMatchObject({
      code: 'io.write-failed',
      message: expect.stringMatching(/target: is a directory; give a file path to write to$/),
    });
    expect(await readdir(sub)).toEqual(['target']);
  });

  it('fails with io.not-a-directory when a parent is a file', async () => {
    const file = join(dir, 'plain-file');
    await writeFile(file, 'x');
    const err = await writeFileAtomic(join(file, 'child.txt'), 'y').catch((e: unknown) => e);
    expect(err).toBeInstanceOf(InputError);
    expect((err as InputError).code).toBe('io.not-a-directory');
  });

  it('removes its temporary file and keeps the old content when writing fails midway', async () => {
    const sub = join(dir, 'midway');
    const path = join(sub, 'keep.txt');
    await writeFileAtomic(path, 'original');
    // A value the file handle refuses makes the write throw after the temporary file exists.
    const bad = Symbol('not data') as unknown as string;
    await expect(writeFileAtomic(path, bad)).rejects.toThrow();
    expect(await readFile(path, 'utf8')).toBe('original');
    expect(await readdir(sub)).toEqual(['keep.txt']);
  });
});

describe('ensureDir', () => {
  it('creates nested folders and accepts one that exists', async () => {
    const path = join(dir, 'a', 'b', 'c');
    await ensureDir(path);
    await ensureDir(path);
    expect((await stat(path)).isDirectory()).toBe(true);
  });

  it('fails with io.not-a-directory when the path is a file', async () => {
    const file = join(dir, 'ensure-file');
    await writeFile(file, 'x');
    await expect(ensureDir(file)).rejects.toMatchObject({ code: 'io.not-a-directory' });
  });
});
