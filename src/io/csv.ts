/**
 * Reading a feature table from CSV or TSV text with a header row.
 *
 * Every column other than the label and id columns is a numeric feature.
 * Problems raise `InputError` with a stable code (`csv.*`) and a one-line
 * message `<path>:<line>:<column>: <what is wrong>; <what is allowed>`
 * (line and column are left out when the problem is not in one cell).
 */
import { createHash } from 'node:crypto';
import { basename, extname } from 'node:path';
import { InputError } from '../core/errors.js';
import type { Dataset } from '../core/types.js';
import {
  RecordReader,
  badCellError,
  countLines,
  classifyBadCell,
  decodeUtf8,
  quoteText,
  readBytes,
  resolveDelimiter,
} from './delimited.js';

export { sniffDelimiter } from './delimited.js';

export interface ReadTableOptions {
  /** Field delimiter: ',', '\t', ';' (or any single character); undefined = sniff from the header line. */
  delimiter?: string;
  /** Name of the categorical label column (kept as text, never a feature). */
  label?: string;
  /** Name of the row id column (kept as text, never a feature). */
  id?: string;
  /** What to do with rows holding empty, NA, NaN or infinite feature cells. Default 'error'. */
  missing?: 'error' | 'drop';
}

const P = 'csv';
const MISSING_FIX = 'every feature cell needs a finite number (use --missing drop to drop such rows)';

/** Column layout decided from the header. */
interface Header {
  names: string[];
  line: number;
  featureIdx: number[];
  labelIdx: number;
  idIdx: number;
}

/** Rows read so far; `data` grows by doubling. */
interface RowStore {
  data: Float64Array;
  n: number;
  labels: string[] | null;
  ids: string[] | null;
  droppedLines: number[];
}

/**
 * Read a CSV/TSV file with a header row into a Dataset.
 *
 * Accepts RFC 4180 double quotes, CRLF or LF line ends and a UTF-8 byte-order
 * mark; empty lines are skipped. Unquoted header names are trimmed of spaces.
 * Feature cells must be plain decimal numbers (`4`, `-1.5e-3`, `+2`, `.5`).
 * Constant (zero-variance) feature columns are dropped with a warning.
 *
 * @returns the dataset (matrix n × d, row-major, in file order) and the
 *   warnings meant for the user (dropped rows, dropped columns).
 * @throws InputError with codes csv.missing-file, csv.unreadable, csv.not-text,
 *   csv.bad-delimiter, csv.empty, csv.no-rows, csv.unnamed-column,
 *   csv.duplicate-column, csv.unknown-column, csv.too-few-features,
 *   csv.ragged-row, csv.unclosed-quote, csv.bad-quote, csv.non-numeric,
 *   csv.missing-value, csv.non-finite, csv.all-rows-dropped, csv.all-constant.
 */
export async function readTable(
  path: string,
  opts: ReadTableOptions = {},
): Promise<{ dataset: Dataset; warnings: string[] }> {
  const bytes = await readBytes(path, P);
  const sha256 = createHash('sha256').update(bytes).digest('hex');
  const text = decodeUtf8(bytes, path, P);
  const delimiter = resolveDelimiter(opts.delimiter, text, `${P}.bad-delimiter`);
  const reader = new RecordReader(text, delimiter, path, P);
  if (!reader.next()) throw new InputError(`${P}.empty`, `${path}: the file is empty; give a table with a header row and at least one data row`);
  const header = readHeader(reader, delimiter, path, opts);
  const rows = readRows(reader, header, path, opts.missing === 'drop', countLines(text));
  const warnings: string[] = [];
  if (rows.droppedLines.length > 0) warnings.push(droppedRowsWarning(rows.droppedLines));
  const featureNames = header.featureIdx.map((j) => header.names[j]);
  const kept = dropConstantColumns(rows.data, rows.n, featureNames, path);
  if (kept.dropped.length > 0) {
    warnings.push(`dropped ${kept.dropped.length} constant (zero-variance) feature column${kept.dropped.length === 1 ? '' : 's'}: ${kept.dropped.map((c) => quoteText(c)).join(', ')}`);
  }
  const dataset: Dataset = {
    path,
    name: basename(path, extname(path)),
    sha256,
    matrix: { n: rows.n, d: kept.columns.length, data: kept.data },
    columns: kept.columns,
    labels: rows.labels,
    ids: rows.ids,
    droppedRows: rows.droppedLines.length,
    droppedColumns: kept.dropped,
  };
  return { dataset, warnings };
}

function readHeader(reader: RecordReader, delimiter: string, path: string, opts: ReadTableOptions): Header {
  const names: string[] = [];
  const seen = new Map<string, number>();
  for (let j = 0; j < reader.count; j++) {
    const raw = reader.field(j);
    const name = reader.isQuoted(j) ? raw : raw.trim();
    const where = (): string => `${path}:${reader.lineOfField(j)}:${j + 1}`;
    if (name === '') {
      throw new InputError(`${P}.unnamed-column`, `${where()}: column ${j + 1} of the header has no name; every column needs a name in the header row`);
    }
    const first = seen.get(name);
    if (first !== undefined) {
      throw new InputError(
        `${P}.duplicate-column`,
        `${where()}: column name ${quoteText(name)} appears twice (columns ${first + 1} and ${j + 1}); column names must be unique`,
      );
    }
    seen.set(name, j);
    names.push(name);
  }
  const line = reader.line;
  const labelIdx = findColumn(names, opts.label, 'label', path, line);
  const idIdx = findColumn(names, opts.id, 'id', path, line);
  const featureIdx: number[] = [];
  for (let j = 0; j < names.length; j++) if (j !== labelIdx && j !== idIdx) featureIdx.push(j);
  if (featureIdx.length < 2) {
    throw new InputError(
      `${P}.too-few-features`,
      `${path}:${line}: the header has ${featureIdx.length} feature column${featureIdx.length === 1 ? '' : 's'} besides the label and id columns; at least 2 numeric feature columns are needed (read with delimiter ${JSON.stringify(delimiter)})`,
    );
  }
  return { names, line, featureIdx, labelIdx, idIdx };
}

function findColumn(names: string[], wanted: string | undefined, role: 'label' | 'id', path: string, line: number): number {
  if (wanted === undefined) return -1;
  const j = names.indexOf(wanted);
  if (j !== -1) return j;
  const near = names.find((n) => n.toLowerCase() === wanted.toLowerCase());
  const hint = near === undefined ? '' : ` (did you mean ${quoteText(near)}?)`;
  throw new InputError(
    `${P}.unknown-column`,
    `${path}:${line}: ${role} column ${quoteText(wanted)} is not in the header${hint}; available columns: ${listNames(names)}`,
  );
}

function listNames(names: string[], max = 20): string {
  const shown = names.slice(0, max).map((n) => quoteText(n)).join(', ');
  return names.length > max ? `${shown}, … (${names.length - max} more)` : shown;
}

function readRows(reader: RecordReader, h: Header, path: string, drop: boolean, maxRows: number): RowStore {
  const d = h.featureIdx.length;
  const ncols = h.names.length;
  const feat = Int32Array.from(h.featureIdx);
  const store: RowStore = {
    data: new Float64Array(Math.max(1, maxRows) * d),
    n: 0,
    labels: h.labelIdx >= 0 ? [] : null,
    ids: h.idIdx >= 0 ? [] : null,
    droppedLines: [],
  };
  let seenRows = 0;
  while (reader.next()) {
    seenRows++;
    if (reader.count !== ncols) throw raggedError(reader, ncols, path);
    if ((store.n + 1) * d > store.data.length) store.data = grow(store.data);
    const out = store.data;
    const base = store.n * d;
    let bad = false;
    for (let k = 0; k < d; k++) {
      const v = reader.number(feat[k]);
      if (v - v === 0) out[base + k] = v;
      else bad = rejectCell(reader, feat[k], h.names[feat[k]], v, path, drop) || bad;
    }
    if (bad) {
      store.droppedLines.push(reader.line);
      continue;
    }
    if (store.labels !== null) store.labels.push(reader.field(h.labelIdx));
    if (store.ids !== null) store.ids.push(reader.field(h.idIdx));
    store.n++;
  }
  if (seenRows === 0) {
    throw new InputError(`${P}.no-rows`, `${path}:${h.line}: the file has a header but no data rows; give at least one data row below the header`);
  }
  if (store.n === 0) {
    throw new InputError(
      `${P}.all-rows-dropped`,
      `${path}: all ${seenRows} data rows have missing or non-finite values; at least one complete row is needed`,
    );
  }
  return store;
}

/** Throws for a bad cell, or returns true when the row is to be dropped. */
function rejectCell(reader: RecordReader, j: number, column: string, v: number, path: string, drop: boolean): boolean {
  const cell = reader.field(j);
  const kind = classifyBadCell(cell, v);
  if (drop && kind !== 'non-numeric') return true;
  const where = `${path}:${reader.lineOfField(j)}:${j + 1}`;
  throw badCellError(kind, P, where, cell, column, MISSING_FIX);
}

function raggedError(reader: RecordReader, expected: number, path: string): InputError {
  const found = reader.count;
  const col = Math.min(found, expected) + 1;
  const line = found > expected ? reader.lineOfField(expected) : reader.lineOfField(found - 1);
  return new InputError(
    `${P}.ragged-row`,
    `${path}:${line}:${col}: the row has ${found} field${found === 1 ? '' : 's'} but the header has ${expected}; every row needs exactly one field per header column (quote fields that contain the delimiter)`,
  );
}

function grow(a: Float64Array): Float64Array {
  const b = new Float64Array(a.length * 2);
  b.set(a);
  return b;
}

function droppedRowsWarning(lines: number[]): string {
  const n = lines.length;
  const shown = lines.slice(0, 5).join(', ');
  const more = n > 5 ? ', …' : '';
  return `dropped ${n} row${n === 1 ? '' : 's'} with missing or non-finite values (line${n === 1 ? '' : 's'} ${shown}${more})`;
}

/**
 * Remove feature columns whose values are all identical (zero variance,
 * checked exactly as max = min rather than through a rounded variance).
 */
function dropConstantColumns(
  data: Float64Array,
  n: number,
  names: string[],
  path: string,
): { data: Float64Array; columns: string[]; dropped: string[] } {
  const d = names.length;
  const keep: number[] = [];
  const dropped: string[] = [];
  for (let k = 0; k < d; k++) {
    const first = data[k];
    let constant = true;
    for (let i = 1; i < n && constant; i++) constant = data[i * d + k] === first;
    if (constant) dropped.push(names[k]);
    else keep.push(k);
  }
  if (keep.length === 0) {
    throw new InputError(`${P}.all-constant`, `${path}: every feature column is constant (zero variance) over the ${n} rows read; at least 2 feature columns must vary`);
  }
  if (keep.length < 2) {
    throw new InputError(
      `${P}.too-few-features`,
      `${path}: only 1 feature column (${quoteText(names[keep[0]])}) varies after dropping constant columns ${dropped.map((c) => quoteText(c)).join(', ')}; at least 2 feature columns must vary`,
    );
  }
  if (dropped.length === 0) return { data: data.slice(0, n * d), columns: names.slice(), dropped };
  const m = keep.length;
  const out = new Float64Array(n * m);
  for (let i = 0; i < n; i++) for (let k = 0; k < m; k++) out[i * m + k] = data[i * d + keep[k]];
  return { data: out, columns: keep.map((k) => names[k]), dropped };
}
