import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { InputError } from '../../src/core/errors.js';
import { formatPointsCsv, readPointsCsv, readResultsDir, writeAuditOutputs } from '../../src/io/write-audit.js';
import { buildReport } from '../../src/report/index.js';
import { makeFixture } from '../report/fixture.js';

const dir = mkdtempSync(path.join(tmpdir(), 'steadyfold-io-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function write(name: string, text: string): string {
  const file = path.join(dir, name);
  writeFileSync(file, text);
  return file;
}

const ids = ['a', 'b', 'c', 'd'];

describe('readPointsCsv', () => {
  it('reads row,id,stability with 0-based rows, NaN for empty cells and for rows not listed', async () => {
    const v = await readPointsCsv(write('p0.csv', 'row,id,stability\n0,a,0.5\n2,c,\n3,d,0.25\n'), ids);
    expect(Array.from(v)).toEqual([0.5, NaN, NaN, 0.25]);
  });

  it('reads 1-based rows too, recognised by the ids matching the data rows', async () => {
    const v = await readPointsCsv(write('p1.csv', 'row,id,stability\n1,a,0.1\n2,b,0.2\n3,c,0.3\n4,d,0.4\n'), ids);
    expect(Array.from(v)).toEqual([0.1, 0.2, 0.3, 0.4]);
  });

  it('accepts quoted ids and columns in any order', async () => {
    const v = await readPointsCsv(write('p2.csv', 'stability,id,row\n0.75,"b",1\n'), ids);
    expect(Array.from(v)).toEqual([NaN, 0.75, NaN, NaN]);
  });

  it('rejects a wrong header, a row outside the data set and ids of another data set, naming the file and line', async () => {
    await expect(readPointsCsv(write('h.csv', 'row,name,value\n0,a,1\n'), ids)).rejects.toMatchObject({ code: 'points.header' });
    await expect(readPointsCsv(write('r.csv', 'row,id,stability\n0,a,1\n9,b,1\n'), ids)).rejects.toMatchObject({
      code: 'points.bad-row',
    });
    const err = await readPointsCsv(write('i.csv', 'row,id,stability\n0,a,1\n1,x,1\n'), ids).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(InputError);
    expect((err as InputError).code).toBe('points.ids');
    expect((err as Error).message).toContain('i.csv:3');
    await expect(readPointsCsv(path.join(dir, 'missing.csv'), ids)).rejects.toMatchObject({ code: 'points.missing-file' });
  });
});

describe('formatPointsCsv', () => {
  it('writes 1-based rows, quotes ids that need it and leaves unknown values empty', () => {
    const text = formatPointsCsv(Float64Array.of(0.5, NaN, 1 / 3), ['a', 'b,"c"', ' d']);
    expect(text).toBe(`row,id,stability\n1,a,0.5\n2,"b,""c""",\n3," d",${1 / 3}\n`);
  });

  it('reads back to the same values (every double bit for bit)', async () => {
    const values = Float64Array.of(0.1 + 0.2, NaN, 1e-17, 0.9999999999999999);
    const back = await readPointsCsv(write('round.csv', formatPointsCsv(values, ids)), ids);
    expect(Array.from(back)).toEqual(Array.from(values));
  });
});

describe('readResultsDir', () => {
  it('reads back the results, the embeddings and every points file written with the audit', async () => {
    const f = makeFixture();
    const out = path.join(dir, 'audit');
    await writeAuditOutputs(out, f.results, f.embeddings, buildReport(f, { png: false }), f.points);
    const back = await readResultsDir(out);
    expect(back.results).toEqual(JSON.parse(JSON.stringify(f.results)));
    expect([...back.embeddings.keys()].sort()).toEqual([...f.embeddings.keys()].sort());
    expect([...back.points.keys()].sort()).toEqual([...f.points!.keys()].sort());
    for (const [id, values] of f.points!) expect(Array.from(back.points.get(id)!)).toEqual(Array.from(values));
    // The report rebuilt from the folder is the report built in memory.
    const again = buildReport(back, { png: false });
    expect(again.html).toBe(buildReport(f, { png: false }).html);
  });

  it('leaves out a points file that is not there instead of failing', async () => {
    const f = makeFixture();
    const out = path.join(dir, 'no-points');
    await writeAuditOutputs(out, f.results, f.embeddings, buildReport(f, { png: false }));
    const back = await readResultsDir(out);
    expect(back.points.size).toBe(0);
    expect(back.embeddings.size).toBe(f.embeddings.size);
  });

  it('fails on a points file that belongs to other data', async () => {
    const f = makeFixture();
    const out = path.join(dir, 'bad-points');
    await writeAuditOutputs(out, f.results, f.embeddings, buildReport(f, { png: false }));
    mkdirSync(path.join(out, 'points'), { recursive: true });
    writeFileSync(path.join(out, 'points', 'tsne-p30-random.csv'), 'row,id,stability\n1,zzz,0.5\n');
    await expect(readResultsDir(out)).rejects.toMatchObject({ code: 'points.ids' });
  });
});
