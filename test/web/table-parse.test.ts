import { describe, expect, it } from 'vitest';
import { InputError } from '../../server/core/errors.js';
import { detectDelimiter, parseCell, parsePolarizationTable, parseTable } from '../../server/web/table-parse.js';
import { expectClose } from '../helpers/close.js';

/** Catch the InputError a call throws (fails the test if it throws nothing or something else). */
function inputErrorOf(fn: () => unknown): InputError {
  try {
    fn();
  } catch (err) {
    expect(err).toBeInstanceOf(InputError);
    return err as InputError;
  }
  throw new Error('expected an InputError');
}

// Hand-written tables: the expected numbers are the literal values typed in each table.
describe('parseTable: separators', () => {
  it('reads tab-separated text (a spreadsheet copy)', () => {
    const t = parseTable('10\t1.5\n20\t2.5\n');
    expect(t.delimiter).toBe('\t');
    expect(t.rows).toEqual([[10, 1.5], [20, 2.5]]);
    expect(t.lines).toEqual([1, 2]);
    expect(t.header).toBeNull();
  });

  it('reads comma-separated text with a decimal point', () => {
    const t = parseTable('1.25,-0.5\n2e3,3.75E-2\n');
    expect(t.delimiter).toBe(',');
    expect(t.decimalComma).toBe(false);
    expect(t.rows[0]).toEqual([1.25, -0.5]);
    expectClose(t.rows[1][0], 2000, { rtol: 0 }, 'exponent form');
    expectClose(t.rows[1][1], 0.0375, { rtol: 1e-15 }, 'exponent form');
  });

  it('reads semicolon-separated text with decimal commas', () => {
    const t = parseTable('0,5;-12,25\n1,5;-13,75\n');
    expect(t.delimiter).toBe(';');
    expect(t.decimalComma).toBe(true);
    expectClose(t.rows[0][0], 0.5, { rtol: 1e-15 });
    expectClose(t.rows[0][1], -12.25, { rtol: 1e-15 });
    expectClose(t.rows[1][1], -13.75, { rtol: 1e-15 });
  });

  it('reads tab-separated text with decimal commas', () => {
    const t = parseTable('0,001\t12,5\n0,01\t40,0');
    expect(t.decimalComma).toBe(true);
    expectClose(t.rows[0][0], 0.001, { rtol: 1e-15 });
    expectClose(t.rows[1][1], 40, { rtol: 1e-15 });
  });

  it('falls back to spaces when no tab, semicolon or comma appears', () => {
    expect(detectDelimiter('1  2\n3 4')).toBe(' ');
    expect(parseTable('  1   2\n3 4\n').rows).toEqual([[1, 2], [3, 4]]);
  });

  it('honours quoted cells and CRLF line ends', () => {
    const t = parseTable('"10";"1,5"\r\n"20";"2,5"\r\n');
    expectClose(t.rows[1][1], 2.5, { rtol: 1e-15 });
  });

  it('reads the Unicode minus sign and drops trailing separators', () => {
    const t = parseTable('1\t\u22120.25\t\n2\t\u22120.5\t\n');
    expect(t.columns).toBe(2);
    expectClose(t.rows[0][1], -0.25, { rtol: 1e-15 });
  });
});

describe('parseTable: header, blank lines, errors', () => {
  it('detects and reports a header row', () => {
    const t = parseTable('j / mA cm-2\tE / mV\n1\t100\n2\t120\n');
    expect(t.header).toEqual(['j / mA cm-2', 'E / mV']);
    expect(t.headerLine).toBe(1);
    expect(t.rows).toEqual([[1, 100], [2, 120]]);
    expect(t.lines).toEqual([2, 3]);
  });

  it('ignores blank lines and # comments, keeping source line numbers', () => {
    const t = parseTable('\n# exported by the test rig\nj;E\n\n1;2\n\n3;4\n');
    expect(t.headerLine).toBe(3);
    expect(t.lines).toEqual([5, 7]);
  });

  it('names the line of a cell that is not a number', () => {
    const text = 'j\tE\n1\t2\n3\t4\n5\t6\n7\t8\n9\tx12\n11\t12\n';
    const err = inputErrorOf(() => parseTable(text));
    expect(err.issues[0].path).toBe('data line 6');
    expect(err.issues[0].message).toContain('column 2');
    expect(err.issues[0].message).toContain('x12');
  });

  it('names the line of a row with the wrong number of columns, with a custom source name', () => {
    const err = inputErrorOf(() => parseTable('1,2\n3,4\n5\n', { source: 'file' }));
    expect(err.issues[0].path).toBe('file line 3');
  });

  it('a comma-separated table written with decimal commas fails at the first row of another width', () => {
    const err = inputErrorOf(() => parseTable('a,b\n1,5,2\n1,5\n'));
    expect(err.issues[0].path).toBe('data line 3');
  });

  it('refuses empty text, header-only text and too many rows', () => {
    expect(inputErrorOf(() => parseTable('   \n ')).issues[0].path).toBe('data');
    expect(inputErrorOf(() => parseTable('j\tE\n')).issues[0].message).toContain('only a header');
    expect(inputErrorOf(() => parseTable('1\n2\n3\n', { maxRows: 2 })).issues[0].message).toContain('more than 2');
  });

  it('parseCell refuses thousands separators and words', () => {
    expect(parseCell('1,000.5', false)).toBeNull();
    expect(parseCell('NaN', false)).toBeNull();
    expect(parseCell('Infinity', false)).toBeNull();
    expect(parseCell('', false)).toBeNull();
    expect(parseCell(' 12 ', false)).toBe(12);
  });
});

describe('parsePolarizationTable', () => {
  it('picks the chosen columns and their header labels', () => {
    const p = parsePolarizationTable('t/s\tE/V\tj/A m-2\n0\t1.1\t10\n5\t1.2\t100\n', { currentColumn: 3, potentialColumn: 2 });
    expect(p.currentDensity).toEqual([10, 100]);
    expect(p.potential).toEqual([1.1, 1.2]);
    expect(p.labels).toEqual({ current: 'j/A m-2', potential: 'E/V' });
  });

  it('needs the chosen columns to exist and differ', () => {
    expect(inputErrorOf(() => parsePolarizationTable('1\t2\n', { currentColumn: 1, potentialColumn: 3 })).issues[0].path).toBe('data line 1');
    expect(inputErrorOf(() => parsePolarizationTable('1\t2\n', { currentColumn: 1, potentialColumn: 1 })).issues[0].path).toBe('potentialColumn');
  });
});
