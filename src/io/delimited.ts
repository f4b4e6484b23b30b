/**
 * Low-level pieces shared by the table readers: reading a file's bytes,
 * decoding UTF-8, sniffing the delimiter, splitting delimited text into
 * records (RFC 4180 quoting) and parsing plain decimal numbers.
 *
 * Error messages name a location as `path:line:column:` when one cell is at
 * fault, `path:line:` when a whole line is, and `path:` when the whole file is.
 * Lines are 1-based physical lines of the file; columns are 1-based field numbers.
 */
import { readFile } from 'node:fs/promises';
import { InputError } from '../core/errors.js';

const QUOTE = 34; // "
const LF = 10;
const CR = 13;

/** Delimiters the sniffer chooses between, in tie-breaking order. */
const SNIFFED = [',', '\t', ';'] as const;

/**
 * Guess the delimiter of a header line: whichever of `,` `\t` `;` occurs most
 * often outside double quotes (ties go to the earlier one in that list), `,`
 * when none occurs. Leading empty lines are skipped and reading stops at the
 * next line break outside quotes, so the whole file text may be passed.
 */
export function sniffDelimiter(headerLine: string): string {
  const counts = [0, 0, 0];
  let quoted = false;
  let content = false;
  for (let i = 0; i < headerLine.length; i++) {
    const c = headerLine.charCodeAt(i);
    if (c === QUOTE) {
      quoted = !quoted;
      content = true;
    } else if (quoted) continue;
    else if (c === LF || c === CR) {
      if (content) break;
      continue;
    }
    content = true;
    if (c === 44) counts[0]++;
    else if (c === 9) counts[1]++;
    else if (c === 59) counts[2]++;
  }
  let best = 0;
  for (let k = 1; k < counts.length; k++) if (counts[k] > counts[best]) best = k;
  return SNIFFED[best];
}

/**
 * Resolve a user-given delimiter: one character other than a quote or line
 * break; `\t` written as backslash-t or `tab` means a tab. Undefined sniffs.
 */
export function resolveDelimiter(given: string | undefined, text: string, code: string): string {
  if (given === undefined) return sniffDelimiter(text);
  const d = given === '\\t' || given.toLowerCase() === 'tab' ? '\t' : given;
  if (d.length !== 1 || d === '"' || d === '\n' || d === '\r') {
    throw new InputError(
      code,
      `delimiter ${JSON.stringify(given)} cannot be used; give one character such as ",", ";" or "\\t" (tab), or leave it out to detect it from the header`,
    );
  }
  return d;
}

/** Read a file's bytes, turning file-system failures into InputErrors (`<prefix>.missing-file`, `<prefix>.unreadable`). */
export async function readBytes(path: string, prefix: string): Promise<Uint8Array> {
  try {
    return await readFile(path);
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code ?? 'unknown error';
    if (code === 'ENOENT') {
      throw new InputError(`${prefix}.missing-file`, `${path}: file not found; give the path of an existing file`);
    }
    if (code === 'EISDIR') {
      throw new InputError(`${prefix}.unreadable`, `${path}: is a directory; give the path of a file`);
    }
    throw new InputError(`${prefix}.unreadable`, `${path}: cannot read the file (${code}); check the path and its permissions`);
  }
}

/** Decode UTF-8 strictly and drop a leading byte-order mark (`<prefix>.not-text` on invalid bytes). */
export function decodeUtf8(bytes: Uint8Array, path: string, prefix: string): string {
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    throw new InputError(`${prefix}.not-text`, `${path}: the file is not UTF-8 text; give a CSV or TSV text file (UTF-8, a byte-order mark is fine)`);
  }
  return text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
}

/** An upper bound on the number of records in `text`: its line count. */
export function countLines(text: string): number {
  let n = 1;
  let i = text.indexOf('\n');
  while (i !== -1) {
    n++;
    i = text.indexOf('\n', i + 1);
  }
  return n;
}

/**
 * Splits delimited text into records, one call to `next()` per record.
 * Fields may be double-quoted (RFC 4180): a quoted field may hold delimiters,
 * line breaks and doubled quotes (`""` = one quote). Records end at `\n` or
 * `\r\n`. Completely empty lines are skipped. The field array is reused
 * between records: copy what you keep.
 */
export class RecordReader {
  /** Offset in the text where each field of the current record starts (at its opening quote, if quoted). */
  private starts = new Int32Array(64);
  /** Offset just after each field's text (plain records only). */
  private ends = new Int32Array(64);
  /** Unescaped field texts, filled only for records that contain quotes. */
  private readonly values: string[] = [];
  /** True when the current record has no quotes: fields are text spans. */
  private plain = true;
  /** Number of fields in the current record. */
  count = 0;
  /** 1-based physical line where the current record starts. */
  line = 0;

  private readonly text: string;
  private readonly delim: string;
  private readonly delimCode: number;
  private readonly path: string;
  private readonly prefix: string;
  private pos = 0;
  private nextLineNo = 1;
  private recordStart = 0;
  /** Cached offset of the next quote / delimiter at or after the scan position; -1 = none left, -2 = not searched yet. */
  private nextQuote = -2;
  private nextDelim = -2;

  constructor(text: string, delimiter: string, path: string, prefix: string) {
    this.text = text;
    this.delim = delimiter;
    this.delimCode = delimiter.charCodeAt(0);
    this.path = path;
    this.prefix = prefix;
  }

  /** Advance to the next non-empty record; false at the end of the text. */
  next(): boolean {
    const t = this.text;
    const len = t.length;
    while (this.pos < len) {
      let end = t.indexOf('\n', this.pos);
      if (end === -1) end = len;
      const stop = end > this.pos && t.charCodeAt(end - 1) === CR ? end - 1 : end;
      if (stop === this.pos) {
        this.pos = end + 1;
        this.nextLineNo++;
        continue;
      }
      this.line = this.nextLineNo;
      this.recordStart = this.pos;
      if (this.nextQuote !== -1 && this.nextQuote < this.pos) this.nextQuote = t.indexOf('"', this.pos);
      if (this.nextQuote === -1 || this.nextQuote >= stop) this.splitPlain(stop);
      else {
        end = this.splitQuoted();
        this.nextLineNo += countNewlines(t, this.recordStart, end);
      }
      this.pos = end + 1;
      this.nextLineNo++;
      return true;
    }
    return false;
  }

  /** Text of field `j` (0-based) of the current record, quotes removed. */
  field(j: number): string {
    return this.plain ? this.text.slice(this.starts[j], this.ends[j]) : this.values[j];
  }

  /** Field `j` read as `parseDecimal` does, without copying plain fields out of the text. */
  number(j: number): number {
    return this.plain ? parseDecimalSpan(this.text, this.starts[j], this.ends[j]) : parseDecimal(this.values[j]);
  }

  /** True when field `j` (0-based) of the current record was written in quotes. */
  isQuoted(j: number): boolean {
    return this.text.charCodeAt(this.starts[j]) === QUOTE;
  }

  /** 1-based physical line of field `j` (0-based) of the current record. */
  lineOfField(j: number): number {
    return this.line + countNewlines(this.text, this.recordStart, this.starts[j]);
  }

  /** Fast path: a line with no quote, fields split on the delimiter. */
  private splitPlain(stop: number): void {
    const t = this.text;
    let s = this.pos;
    let c = 0;
    this.plain = true;
    for (;;) {
      if (this.nextDelim !== -1 && this.nextDelim < s) this.nextDelim = t.indexOf(this.delim, s);
      const d = this.nextDelim;
      if (c === this.starts.length) this.growSpans();
      this.starts[c] = s;
      if (d === -1 || d >= stop) {
        this.ends[c++] = stop;
        break;
      }
      this.ends[c++] = d;
      s = d + 1;
    }
    this.count = c;
  }

  private growSpans(): void {
    const starts = new Int32Array(this.starts.length * 2);
    starts.set(this.starts);
    this.starts = starts;
    const ends = new Int32Array(this.ends.length * 2);
    ends.set(this.ends);
    this.ends = ends;
  }

  /** Slow path: a record with quotes, scanned field by field; returns the offset of its ending `\n` (or the text length). */
  private splitQuoted(): number {
    const t = this.text;
    const len = t.length;
    let i = this.pos;
    let c = 0;
    this.plain = false;
    for (;;) {
      const start = i;
      let value: string;
      if (i < len && t.charCodeAt(i) === QUOTE) {
        [value, i] = this.readQuoted(i, c);
      } else {
        while (i < len) {
          const ch = t.charCodeAt(i);
          if (ch === this.delimCode || ch === LF) break;
          i++;
        }
        const stop = i > start && t.charCodeAt(i - 1) === CR && (i === len || t.charCodeAt(i) === LF) ? i - 1 : i;
        value = t.slice(start, stop);
      }
      this.put(c++, start, value);
      if (i >= len) {
        this.count = c;
        return len;
      }
      const ch = t.charCodeAt(i);
      if (ch === this.delimCode) {
        i++;
        continue;
      }
      if (ch === LF) {
        this.count = c;
        return i;
      }
      if (ch === CR && (i + 1 === len || t.charCodeAt(i + 1) === LF)) {
        this.count = c;
        return i + 1;
      }
      const line = this.line + countNewlines(t, this.recordStart, i);
      let upTo = i;
      while (upTo < len && upTo < i + 10 && t.charCodeAt(upTo) !== LF && t.charCodeAt(upTo) !== CR) upTo++;
      throw new InputError(
        `${this.prefix}.bad-quote`,
        `${this.path}:${line}:${c}: unexpected text ${JSON.stringify(t.slice(i, upTo))} after the closing quote of field ${c}; a quoted field must end with a quote followed by the delimiter or a line break (write "" for a quote inside a quoted field)`,
      );
    }
  }

  /** Read the quoted field starting at `open`; returns its unescaped text and the offset just after the closing quote. */
  private readQuoted(open: number, fieldIndex: number): [string, number] {
    const t = this.text;
    let value = '';
    let seg = open + 1;
    for (;;) {
      const q = t.indexOf('"', seg);
      if (q === -1) {
        const line = this.line + countNewlines(t, this.recordStart, open);
        throw new InputError(
          `${this.prefix}.unclosed-quote`,
          `${this.path}:${line}:${fieldIndex + 1}: a quoted field is never closed; end it with a quote (write "" for a quote inside a quoted field)`,
        );
      }
      if (t.charCodeAt(q + 1) === QUOTE) {
        value += t.slice(seg, q + 1);
        seg = q + 2;
        continue;
      }
      value += t.slice(seg, q);
      return [value, q + 1];
    }
  }

  private put(c: number, start: number, value: string): void {
    if (c === this.starts.length) this.growSpans();
    this.values[c] = value;
    this.starts[c] = start;
  }
}

function countNewlines(text: string, from: number, to: number): number {
  let n = 0;
  let i = text.indexOf('\n', from);
  while (i !== -1 && i < to) {
    n++;
    i = text.indexOf('\n', i + 1);
  }
  return n;
}

function hasDigit(s: string): boolean {
  for (let i = 0; i < s.length; i++) {
    const c = s.charCodeAt(i);
    if (c >= 48 && c <= 57) return true;
  }
  return false;
}

/** True when the (trimmed) text starts like `0x`, `0b` or `0o`. */
function hasRadixPrefix(s: string): boolean {
  if (s.charCodeAt(0) !== 48) return false;
  const c = s.charCodeAt(1) | 0x20;
  return c === 0x78 || c === 0x62 || c === 0x6f;
}

/**
 * Parse a plain decimal number such as `4`, `-1.5e-3`, `+2` or `.5`
 * (surrounding spaces allowed). Returns NaN for anything else — empty or
 * blank text, `0x`/`0b`/`0o` literals, words — and ±Infinity for `Infinity`
 * or a value that overflows a double. `Number('')` is 0, so blank text is
 * checked for explicitly.
 */
export function parseDecimal(s: string): number {
  const v = +s;
  if (v !== v) return NaN;
  if (v === 0 && !hasDigit(s)) return NaN;
  const c0 = s.charCodeAt(0);
  // A leading 1-9, sign or dot cannot start a radix literal (Number('-0x1') is NaN already).
  if (c0 === 48) {
    const c1 = s.charCodeAt(1) | 0x20;
    if (c1 === 0x78 || c1 === 0x62 || c1 === 0x6f) return NaN;
  } else if ((c0 < 49 || c0 > 57) && c0 !== 45 && c0 !== 43 && c0 !== 46 && hasRadixPrefix(s.trim())) {
    return NaN;
  }
  return v;
}

/** Exact powers of ten: every 10^k with k ≤ 22 is a double. */
const POW10 = [1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22];

/**
 * `parseDecimal(text.slice(start, end))`, computed without the copy when the
 * text is a plain decimal of at most 15 significant digits whose power of
 * ten is at most 22 in size: then mantissa and power are exact doubles and a
 * single multiplication or division rounds correctly (Clinger 1990, "How to
 * read floating point numbers accurately"), giving the same double as
 * `Number()`. Anything else goes through `parseDecimal`.
 */
export function parseDecimalSpan(text: string, start: number, end: number): number {
  let i = start;
  let negative = false;
  let c = text.charCodeAt(i);
  if (c === 45 || c === 43) {
    negative = c === 45;
    c = text.charCodeAt(++i);
  }
  let mantissa = 0;
  let digits = 0;
  let significant = 0;
  let scale = 0;
  while (i < end && c >= 48 && c <= 57) {
    if (significant > 0 || c !== 48) significant++;
    mantissa = mantissa * 10 + (c - 48);
    digits++;
    c = text.charCodeAt(++i);
  }
  if (i < end && c === 46) {
    c = text.charCodeAt(++i);
    while (i < end && c >= 48 && c <= 57) {
      if (significant > 0 || c !== 48) significant++;
      mantissa = mantissa * 10 + (c - 48);
      digits++;
      scale--;
      c = text.charCodeAt(++i);
    }
  }
  if (i < end && (c | 0x20) === 0x65 && digits > 0) {
    let expNegative = false;
    c = text.charCodeAt(++i);
    if (c === 45 || c === 43) {
      expNegative = c === 45;
      c = text.charCodeAt(++i);
    }
    let exp = 0;
    let expDigits = 0;
    while (i < end && c >= 48 && c <= 57 && exp < 10000) {
      exp = exp * 10 + (c - 48);
      expDigits++;
      c = text.charCodeAt(++i);
    }
    if (expDigits === 0) i = -1;
    scale += expNegative ? -exp : exp;
  }
  if (i !== end || digits === 0 || significant > 15 || scale > 22 || scale < -22) {
    return parseDecimal(text.slice(start, end));
  }
  const v = scale >= 0 ? mantissa * POW10[scale] : mantissa / POW10[-scale];
  return negative ? -v : v;
}

/** Cell texts read as "missing" (compared trimmed and lower-cased). */
const MISSING_TOKENS = new Set(['', 'na', 'n/a', '#n/a', 'nan', '-nan', '+nan', 'null', 'none']);
const INFINITE_TOKENS = new Set(['inf', '+inf', '-inf', 'infinity', '+infinity', '-infinity']);

/** Why a cell that `parseDecimal` rejected is unusable. */
export type BadCellKind = 'missing' | 'non-finite' | 'non-numeric';

/** Classify a cell whose `parseDecimal` value is not finite. */
export function classifyBadCell(s: string, parsed: number): BadCellKind {
  if (parsed === Infinity || parsed === -Infinity) return 'non-finite';
  const key = s.trim().toLowerCase();
  if (MISSING_TOKENS.has(key)) return 'missing';
  if (INFINITE_TOKENS.has(key)) return 'non-finite';
  return 'non-numeric';
}

/** Quote a cell or column name for a one-line message, shortening long text. */
export function quoteText(s: string, max = 40): string {
  return JSON.stringify(s.length > max ? `${s.slice(0, max)}…` : s);
}

/** Build the InputError for a bad numeric cell (`<prefix>.missing-value`, `.non-finite` or `.non-numeric`). */
export function badCellError(
  kind: BadCellKind,
  prefix: string,
  where: string,
  cell: string,
  column: string,
  fix: string,
): InputError {
  const col = quoteText(column);
  if (kind === 'missing') {
    const what = cell.trim() === '' ? 'an empty cell' : `a missing value ${quoteText(cell)}`;
    return new InputError(`${prefix}.missing-value`, `${where}: column ${col} has ${what}; ${fix}`);
  }
  if (kind === 'non-finite') {
    return new InputError(`${prefix}.non-finite`, `${where}: cell ${quoteText(cell)} in column ${col} is not a finite number; ${fix}`);
  }
  return new InputError(
    `${prefix}.non-numeric`,
    `${where}: cell ${quoteText(cell)} in column ${col} is not a number; cells must be plain decimal numbers such as 4, -1.5e-3, +2 or .5`,
  );
}
