import { mkdtemp, readFile, readdir, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { InputError, InternalError } from '../../src/core/errors.js';
import { Rng } from '../../src/core/rng.js';
import type { Embedding } from '../../src/core/types.js';
import { formatEmbeddingCsv, readEmbeddingCsv, writeEmbeddingCsv } from '../../src/io/embedding-csv.js';

let dir: string;
let counter = 0;

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'steadyfold-emb-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

function embedding(values: number[]): Embedding {
  return { n: values.length / 2, data: Float64Array.from(values) };
}

/** The 64-bit patterns of the coordinates, so that -0 and 0 (and every last bit) differ. */
function bits(e: Embedding): bigint[] {
  return Array.from(new BigUint64Array(e.data.buffer, e.data.byteOffset, e.data.length));
}

async function fileWith(content: string): Promise<string> {
  const path = join(dir, `e${counter++}.csv`);
  await writeFile(path, content);
  return path;
}

async function failure(content: string): Promise<{ err: InputError; path: string }> {
  const path = await fileWith(content);
  const err = await readEmbeddingCsv(path).then(
    () => {
      throw new Error('expected readEmbeddingCsv to fail');
    },
    (e: unknown) => e,
  );
  expect(err).toBeInstanceOf(InputError);
  expect((err as InputError).message).not.toContain('\n');
  return { err: err as InputError, path };
}

describe('writeEmbeddingCsv and readEmbeddingCsv', () => {
  it('round-trip awkward doubles to the exact bit, negative zero included', async () => {
    const awkward = [
      1 / 3, -2 / 3, 0.1 + 0.2, 1e-300, -1e-300, 5e-324, -5e-324, 2.2250738585072014e-308,
      Number.MAX_VALUE, -Number.MAX_VALUE, Number.EPSILON, 1 + Number.EPSILON, Math.PI, -Math.E,
      0, -0, 123456789.12345679, 9007199254740993, 1e21, 1.5e-7,
    ];
    const e = embedding(awkward);
    const path = join(dir, 'awkward.csv');
    await writeEmbeddingCsv(path, e);
    const back = await readEmbeddingCsv(path);
    expect(back.n).toBe(e.n);
    expect(bits(back)).toEqual(bits(e));
  });

  it('round-trip 2000 random coordinates over many magnitudes to the exact bit', async () => {
    const rng = new Rng(7);
    const values: number[] = [];
    for (let i = 0; i < 4000; i++) values.push(rng.normal() * 10 ** (rng.int(40) - 20));
    const e = embedding(values);
    const path = join(dir, 'random.csv');
    await writeEmbeddingCsv(path, e);
    expect(bits(await readEmbeddingCsv(path))).toEqual(bits(e));
  });

  it('write a header x,y and one line per point in input order', async () => {
    const path = join(dir, 'small.csv');
    await writeEmbeddingCsv(path, embedding([1.5, -2, 0.25, 1 / 3, -0, 3]));
    expect(await readFile(path, 'utf8')).toBe('x,y\n1.5,-2\n0.25,0.3333333333333333\n-0,3\n');
  });

  it('use at most 17 significant digits per coordinate', () => {
    const text = formatEmbeddingCsv(embedding([1 / 3, 2 / 3, Math.PI, 0.1 + 0.2]));
    for (const cell of text.trim().split('\n').slice(1).join(',').split(',')) {
      const mantissa = cell.replace(/^-/, '').replace(/e.*$/, '').replace('.', '').replace(/^0+/, '');
      expect(mantissa.length).toBeLessThanOrEqual(17);
    }
  });

  it('write and read an embedding of zero points', async () => {
    const path = join(dir, 'none.csv');
    await writeEmbeddingCsv(path, embedding([]));
    expect(await readFile(path, 'utf8')).toBe('x,y\n');
    expect((await readEmbeddingCsv(path)).n).toBe(0);
  });

  it('leave no temporary file behind', async () => {
    const sub = join(dir, 'clean');
    await writeEmbeddingCsv(join(sub, 'a.csv'), embedding([1, 2]));
    expect(await readdir(sub)).toEqual(['a.csv']);
  });

  it('refuse to write NaN or infinite coordinates, or a wrongly sized buffer', async () => {
    expect(() => formatEmbeddingCsv(embedding([1, 2, Number.NaN, 0]))).toThrow(InternalError);
    expect(() => formatEmbeddingCsv(embedding([Infinity, 2]))).toThrow(/point 0 has a non-finite coordinate/);
    expect(() => formatEmbeddingCsv({ n: 2, data: new Float64Array(3) })).toThrow(InternalError);
    const path = join(dir, 'never.csv');
    await expect(writeEmbeddingCsv(path, embedding([1, Number.NaN]))).rejects.toBeInstanceOf(InternalError);
    await expect(readFile(path)).rejects.toMatchObject({ code: 'ENOENT' });
  });
});

describe('readEmbeddingCsv', () => {
  it('takes any two columns in order, whatever their names', async () => {
    const e = await readEmbeddingCsv(await fileWith('pc1,pc2\n1,2\n3,4\n'));
    expect(Array.from(e.data)).toEqual([1, 2, 3, 4]);
  });

  it('takes the columns named x and y from a wider table', async () => {
    const e = await readEmbeddingCsv(await fileWith('row,y,label,x\n1,10,a,20\n2,11,b,21\n'));
    expect(Array.from(e.data)).toEqual([20, 10, 21, 11]);
  });

  it('reads tab-separated files, CRLF and a byte-order mark', async () => {
    const e = await readEmbeddingCsv(await fileWith('\uFEFFx\ty\r\n1\t2\r\n'));
    expect(Array.from(e.data)).toEqual([1, 2]);
  });

  it('reports a missing file', async () => {
    const path = join(dir, 'absent.csv');
    await expect(readEmbeddingCsv(path)).rejects.toMatchObject({ code: 'embedding.missing-file', message: `${path}: file not found; give the path of an existing file` });
  });

  it('reports an empty file', async () => {
    const { err, path } = await failure('');
    expect(err.code).toBe('embedding.empty');
    expect(err.message).toBe(`${path}: the file is empty; an embedding file needs a header such as x,y`);
  });

  it('reports a header that is neither 2 columns nor has x and y', async () => {
    for (const header of ['x', 'a,b,c', 'x,x,y']) {
      const { err, path } = await failure(`${header}\n`);
      expect(err.code).toBe('embedding.columns');
      expect(err.message.startsWith(`${path}:1: the header has `)).toBe(true);
      expect(err.message).toMatch(/; an embedding file needs exactly 2 columns, or one column named "x" and one named "y"$/);
    }
  });

  it('reports a ragged row with its line and counts', async () => {
    const { err, path } = await failure('x,y\n1,2\n3\n');
    expect(err.code).toBe('embedding.ragged-row');
    expect(err.message).toBe(`${path}:3:2: the row has 1 field but the header has 2; every row needs one field per header column`);
  });

  it('reports text, empty and non-finite coordinates with line and column', async () => {
    const text = await failure('x,y\n1,2\n3,four\n');
    expect(text.err.code).toBe('embedding.non-numeric');
    expect(text.err.message.startsWith(`${text.path}:3:2: cell "four" in column "y" is not a number;`)).toBe(true);
    const empty = await failure('x,y\n,2\n');
    expect(empty.err.code).toBe('embedding.missing-value');
    expect(empty.err.message).toBe(`${empty.path}:2:1: column "x" has an empty cell; every coordinate must be a finite number`);
    const nan = await failure('x,y\n1,NaN\n');
    expect(nan.err.code).toBe('embedding.missing-value');
    const inf = await failure('x,y\n1,Infinity\n');
    expect(inf.err.code).toBe('embedding.non-finite');
    expect(inf.err.message).toMatch(/:2:2: cell "Infinity" in column "y" is not a finite number; every coordinate must be a finite number$/);
  });
});

describe('embeddings of a subset of rows', () => {
  it('write a 1-based row column and read it back', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'emb-rows-'));
    const e = { n: 3, data: Float64Array.from([0.5, 1, -2, 3, 1 / 3, 4]), rows: Int32Array.from([0, 4, 9]) };
    const file = join(dir, 'e.csv');
    await writeEmbeddingCsv(file, e);
    const lines = (await readFile(file, 'utf8')).split('\n');
    expect(lines[0]).toBe('row,x,y');
    expect(lines[2]).toBe('5,-2,3');
    const back = await readEmbeddingCsv(file);
    expect(Array.from(back.rows!)).toEqual([0, 4, 9]);
    expect(Array.from(back.data)).toEqual(Array.from(e.data));
    await rm(dir, { recursive: true, force: true });
  });

  it('refuse row numbers that are not increasing, naming line and column', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'emb-rows-'));
    const file = join(dir, 'bad.csv');
    await writeFile(file, 'row,x,y\n2,0,0\n2,1,1\n');
    await expect(readEmbeddingCsv(file)).rejects.toThrow(/bad\.csv:3:1: row number "2" is not allowed/);
    await rm(dir, { recursive: true, force: true });
  });
});
