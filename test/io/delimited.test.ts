import { describe, expect, it } from 'vitest';
import { Rng } from '../../src/core/rng.js';
import { RecordReader, classifyBadCell, parseDecimal, parseDecimalSpan, resolveDelimiter } from '../../src/io/delimited.js';

/** A random decimal literal: sign, integer part, fraction, exponent, each optional. */
function randomDecimal(rng: Rng): string {
  const digits = (n: number) => Array.from({ length: n }, () => String(rng.int(10))).join('');
  const sign = ['', '-', '+'][rng.int(3)];
  const zeros = rng.int(4) === 0 ? '0'.repeat(rng.int(6)) : '';
  const int = digits(rng.int(19));
  const frac = rng.int(3) === 0 ? '' : `.${zeros}${digits(rng.int(19))}`;
  const exp = rng.int(3) === 0 ? `${['e', 'E'][rng.int(2)]}${['', '-', '+'][rng.int(3)]}${rng.int(40)}` : '';
  return `${sign}${zeros}${int}${frac}${exp}`;
}

describe('parseDecimalSpan', () => {
  it('gives the same double as Number() for 20 000 random decimal literals', () => {
    // Oracle: the platform's Number(), i.e. ECMAScript StringToNumber, which Node/V8 rounds correctly.
    const rng = new Rng(11);
    let compared = 0;
    for (let t = 0; t < 20000; t++) {
      const s = randomDecimal(rng);
      const expected = Number(s);
      if (!Number.isFinite(expected) || s.replace(/[^0-9]/g, '') === '') continue;
      const padded = `ab,${s};cd`;
      const got = parseDecimalSpan(padded, 3, 3 + s.length);
      if (!Object.is(got, expected)) throw new Error(`${s}: got ${got}, Number() gives ${expected}`);
      compared++;
    }
    expect(compared).toBeGreaterThan(15000);
  });

  it('agrees with parseDecimal on text that is not a plain short decimal', () => {
    for (const s of ['', ' ', '1e', 'e5', '.', '-', '+-1', '0x10', '1_0', ' 1.5', '1.5 ', 'NaN', 'Infinity', '1e400', '1e-400', '12345678901234567890', '0.1e-30']) {
      const padded = `x,${s},y`;
      expect(Object.is(parseDecimalSpan(padded, 2, 2 + s.length), parseDecimal(s))).toBe(true);
    }
  });

  it('keeps the sign of negative zero as Number() does', () => {
    expect(Object.is(parseDecimalSpan('-0', 0, 2), -0)).toBe(true);
    expect(Object.is(parseDecimalSpan('-0.0e3', 0, 6), -0)).toBe(true);
  });
});

describe('parseDecimal', () => {
  it('accepts plain decimals with optional sign, dot, exponent and spaces', () => {
    expect(parseDecimal('-1.5e-3')).toBe(-0.0015);
    expect(parseDecimal('+2')).toBe(2);
    expect(parseDecimal('.5')).toBe(0.5);
    expect(parseDecimal(' 7\t')).toBe(7);
    expect(parseDecimal('0')).toBe(0);
  });

  it('returns NaN for blank text, radix literals and words, where Number() would not always', () => {
    for (const s of ['', '  ', '\t', '0x1f', '0B11', '0o7', '\u00a00x1', 'abc', '1,5']) expect(parseDecimal(s)).toBeNaN();
  });

  it('passes infinities through so that callers can call them non-finite', () => {
    expect(parseDecimal('-Infinity')).toBe(-Infinity);
    expect(parseDecimal('1e999')).toBe(Infinity);
  });
});

describe('classifyBadCell', () => {
  it('calls blanks and NA-like tokens missing, infinities non-finite and other text non-numeric', () => {
    expect(classifyBadCell('', Number.NaN)).toBe('missing');
    expect(classifyBadCell(' NA ', Number.NaN)).toBe('missing');
    expect(classifyBadCell('null', Number.NaN)).toBe('missing');
    expect(classifyBadCell('#N/A', Number.NaN)).toBe('missing');
    expect(classifyBadCell('-inf', Number.NaN)).toBe('non-finite');
    expect(classifyBadCell('1e999', Infinity)).toBe('non-finite');
    expect(classifyBadCell('0x10', Number.NaN)).toBe('non-numeric');
    expect(classifyBadCell('n.a.', Number.NaN)).toBe('non-numeric');
  });
});

describe('resolveDelimiter', () => {
  it('turns backslash-t and "tab" into a tab and keeps other single characters', () => {
    expect(resolveDelimiter('\\t', '', 'x.bad')).toBe('\t');
    expect(resolveDelimiter('TAB', '', 'x.bad')).toBe('\t');
    expect(resolveDelimiter('|', '', 'x.bad')).toBe('|');
  });

  it('rejects quotes, line breaks and multi-character delimiters with the given code', () => {
    for (const d of ['"', '\n', ',,', '']) expect(() => resolveDelimiter(d, '', 'x.bad')).toThrow(expect.objectContaining({ code: 'x.bad' }));
  });
});

describe('RecordReader', () => {
  function records(text: string, delimiter = ','): string[][] {
    const r = new RecordReader(text, delimiter, 'f', 'p');
    const out: string[][] = [];
    while (r.next()) out.push(Array.from({ length: r.count }, (_, j) => r.field(j)));
    return out;
  }

  it('splits plain and quoted records alike', () => {
    expect(records('a,b\n1,2\n"x,y","say ""hi"""\n,\n')).toEqual([['a', 'b'], ['1', '2'], ['x,y', 'say "hi"'], ['', '']]);
  });

  it('keeps empty quoted fields and fields with CRLF inside quotes', () => {
    expect(records('"",1\r\n"a\r\nb",2\r\n')).toEqual([['', '1'], ['a\r\nb', '2']]);
  });

  it('reports the physical line of each record, counting quoted line breaks', () => {
    const r = new RecordReader('h\n\n"a\nb\nc"\nd\n', ',', 'f', 'p');
    const lines: number[] = [];
    while (r.next()) lines.push(r.line);
    expect(lines).toEqual([1, 3, 6]);
  });

  it('handles more fields than its initial buffers hold', () => {
    const row = Array.from({ length: 300 }, (_, i) => String(i));
    const quoted = row.map((v) => `"${v}"`);
    expect(records(`${row.join(',')}\n${quoted.join(',')}\n`)).toEqual([row, row]);
  });
});
