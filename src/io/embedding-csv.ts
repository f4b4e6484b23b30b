/**
 * Embedding files: a header `x,y` and one row per point, in input order.
 *
 * Coordinates are written with `String(v)`, the shortest text that reads back
 * to the same double (at most 17 significant digits), so a write followed by
 * a read returns every coordinate bit for bit. Negative zero is written as
 * `-0` so that it too survives the round trip. NaN and ±Infinity cannot be
 * written: an embedding holding them is a failed run, not a result.
 */
import { InputError, InternalError } from '../core/errors.js';
import type { Embedding } from '../core/types.js';
import { writeFileAtomic } from './atomic.js';
import {
  RecordReader,
  badCellError,
  classifyBadCell,
  decodeUtf8,
  quoteText,
  readBytes,
  sniffDelimiter,
} from './delimited.js';

const P = 'embedding';

/** Text of one coordinate: shortest round-trip form, `-0` kept. */
function formatCoordinate(v: number): string {
  return v === 0 && 1 / v < 0 ? '-0' : String(v);
}

/**
 * The CSV text of an embedding (header `x,y`, LF line ends, trailing newline).
 * An embedding of a subset of rows gets a leading `row` column with the
 * 1-based data row number of each point (header `row,x,y`).
 */
export function formatEmbeddingCsv(e: Embedding): string {
  if (e.data.length !== 2 * e.n) {
    throw new InternalError(`embedding has ${e.data.length} coordinates for ${e.n} points; expected ${2 * e.n}`);
  }
  const rows = e.rows;
  if (rows && rows.length !== e.n) throw new InternalError(`embedding lists ${rows.length} rows for ${e.n} points`);
  const parts: string[] = new Array(e.n + 1);
  parts[0] = rows ? 'row,x,y\n' : 'x,y\n';
  for (let i = 0; i < e.n; i++) {
    const x = e.data[2 * i];
    const y = e.data[2 * i + 1];
    if (!Number.isFinite(x) || !Number.isFinite(y)) {
      throw new InternalError(`embedding point ${i} has a non-finite coordinate (${x}, ${y}); a failed run must not be written`);
    }
    parts[i + 1] = `${rows ? `${rows[i] + 1},` : ''}${formatCoordinate(x)},${formatCoordinate(y)}\n`;
  }
  return parts.join('');
}

/**
 * Write an n × 2 embedding to `path` atomically (parent folders are created).
 * @throws InternalError when a coordinate is NaN/±Infinity or the shape is wrong;
 *   InputError 'io.write-failed' when the file cannot be written.
 */
export async function writeEmbeddingCsv(path: string, e: Embedding): Promise<void> {
  await writeFileAtomic(path, formatEmbeddingCsv(e));
}

/**
 * Read an embedding file. The header must name exactly 2 columns (used in
 * order, whatever their names) or include columns named `x` and `y`. The
 * delimiter (`,` `\t` `;`) is detected from the header. A header with no data
 * rows gives an embedding of 0 points.
 * @throws InputError with codes embedding.missing-file, embedding.unreadable,
 *   embedding.not-text, embedding.empty, embedding.columns, embedding.ragged-row,
 *   embedding.unclosed-quote, embedding.bad-quote, embedding.non-numeric,
 *   embedding.missing-value, embedding.non-finite.
 */
export async function readEmbeddingCsv(path: string): Promise<Embedding> {
  const text = decodeUtf8(await readBytes(path, P), path, P);
  const reader = new RecordReader(text, sniffDelimiter(text), path, P);
  if (!reader.next()) throw new InputError(`${P}.empty`, `${path}: the file is empty; an embedding file needs a header such as x,y`);
  const names: string[] = [];
  for (let j = 0; j < reader.count; j++) names.push(reader.isQuoted(j) ? reader.field(j) : reader.field(j).trim());
  const [cx, cy] = pickColumns(names, path, reader.line);
  const ncols = names.length;
  const cr = ncols === 3 && names.indexOf('row') !== -1 ? names.indexOf('row') : -1;
  const rowList: number[] = [];
  let data = new Float64Array(2048);
  let n = 0;
  while (reader.next()) {
    if (reader.count !== ncols) {
      const col = Math.min(reader.count, ncols) + 1;
      throw new InputError(
        `${P}.ragged-row`,
        `${path}:${reader.line}:${col}: the row has ${reader.count} field${reader.count === 1 ? '' : 's'} but the header has ${ncols}; every row needs one field per header column`,
      );
    }
    if (2 * n + 2 > data.length) {
      const bigger = new Float64Array(data.length * 2);
      bigger.set(data);
      data = bigger;
    }
    data[2 * n] = coordinate(reader, cx, names[cx], path);
    data[2 * n + 1] = coordinate(reader, cy, names[cy], path);
    if (cr >= 0) {
      const r = reader.number(cr);
      const prev = rowList.length > 0 ? rowList[rowList.length - 1] : -1;
      if (!Number.isInteger(r) || r < 1 || r - 1 <= prev) {
        throw new InputError(
          `${P}.bad-row`,
          `${path}:${reader.lineOfField(cr)}:${cr + 1}: row number ${quoteText(reader.field(cr))} is not allowed; the "row" column holds 1-based data row numbers in increasing order`,
        );
      }
      rowList.push(r - 1);
    }
    n++;
  }
  return cr >= 0 ? { n, data: data.slice(0, 2 * n), rows: Int32Array.from(rowList) } : { n, data: data.slice(0, 2 * n) };
}

function pickColumns(names: string[], path: string, line: number): [number, number] {
  if (names.length === 2) return [0, 1];
  const x = names.indexOf('x');
  const y = names.indexOf('y');
  if (names.length > 2 && x !== -1 && y !== -1 && names.lastIndexOf('x') === x && names.lastIndexOf('y') === y) return [x, y];
  const shown = names.slice(0, 10).map((s) => quoteText(s)).join(', ');
  throw new InputError(
    `${P}.columns`,
    `${path}:${line}: the header has ${names.length} column${names.length === 1 ? '' : 's'} (${shown}); an embedding file needs exactly 2 columns, or one column named "x" and one named "y"`,
  );
}

function coordinate(reader: RecordReader, j: number, column: string, path: string): number {
  const v = reader.number(j);
  if (v - v === 0) return v;
  const s = reader.field(j);
  const where = `${path}:${reader.lineOfField(j)}:${j + 1}`;
  throw badCellError(classifyBadCell(s, v), P, where, s, column, 'every coordinate must be a finite number');
}
