/**
 * Parse a pasted spreadsheet block or an uploaded CSV file into numeric rows (web edge only;
 * no units or physics here: the caller says what the columns mean and converts to SI).
 *
 * Accepted text:
 * - separated by tabs (what a spreadsheet copy gives), semicolons, or commas; when none of
 *   these appear on any line, runs of spaces also separate columns;
 * - a decimal comma ("1,25") when the separator is not a comma;
 * - an optional header row: the first non-blank row is taken as a header when any of its
 *   cells is not a number, and reported back so the page can show it;
 * - blank lines and lines starting with "#" are ignored;
 * - the Unicode minus sign (U+2212) some spreadsheets paste is read as "-".
 *
 * Every other problem is an InputError whose path names the data line, e.g. `data line 7`.
 * Splitting honours quoted cells, via papaparse.
 */
import Papa from 'papaparse';
import { InputError } from '../core/errors.js';

export type Delimiter = '\t' | ';' | ',' | ' ';

export interface ParsedTable {
  /** Separator used. */
  delimiter: Delimiter;
  /** True when numbers were read with a decimal comma. */
  decimalComma: boolean;
  /** Cells of the header row, when one was detected. */
  header: string[] | null;
  /** 1-based line number of the header row in the source text, when one was detected. */
  headerLine: number | null;
  /** Number of columns in every data row. */
  columns: number;
  /** Numeric rows, each `columns` long. */
  rows: number[][];
  /** 1-based source line number of each row (same order as `rows`). */
  lines: number[];
}

export interface TableParseOptions {
  /** Prefix of error paths, e.g. "data" → `data line 7`. Default "data". */
  source?: string;
  /** Fewest columns a data row must have. Default 1. */
  minColumns?: number;
  /** Most data rows accepted. Default 100 000. */
  maxRows?: number;
}

/** Default ceiling on data rows (matches the fit API's limit). */
export const MAX_TABLE_ROWS = 100_000;

const NUMBER_PATTERN = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;
const UNICODE_MINUS = /\u2212/g;

function sourceLines(text: string): string[] {
  return text.replace(/^\uFEFF/, '').split(/\r\n|\n|\r/);
}

function isSkipped(line: string): boolean {
  const t = line.trim();
  return t === '' || t.startsWith('#');
}

/**
 * Choose the separator: tab if any line has one, else semicolon, else comma, else spaces.
 * A semicolon outranks a comma because a file with semicolons and commas is the usual
 * decimal-comma export (common practice of spreadsheets in comma-decimal locales).
 */
export function detectDelimiter(text: string): Delimiter {
  const lines = sourceLines(text).filter((l) => !isSkipped(l));
  if (lines.some((l) => l.includes('\t'))) return '\t';
  if (lines.some((l) => l.includes(';'))) return ';';
  if (lines.some((l) => l.includes(','))) return ',';
  return ' ';
}

/**
 * Read one cell as a number, or return null when it is not one. With `decimalComma` a single
 * comma is read as the decimal mark; thousands separators are not accepted (ambiguous).
 */
export function parseCell(cell: string, decimalComma: boolean): number | null {
  let t = cell.trim().replace(UNICODE_MINUS, '-');
  if (decimalComma) t = t.replace(',', '.');
  if (!NUMBER_PATTERN.test(t)) return null;
  const v = Number(t);
  return Number.isFinite(v) ? v : null;
}

function splitLine(line: string, delimiter: Delimiter): string[] {
  if (delimiter === ' ') return line.trim().split(/\s+/);
  const result = Papa.parse<string[]>(line, { delimiter, quoteChar: '"', skipEmptyLines: false });
  const row = result.data[0] ?? [];
  // Spreadsheets often end a row with a separator: drop trailing empty cells.
  const out = row.slice();
  while (out.length > 0 && out[out.length - 1].trim() === '') out.pop();
  return out;
}

function describeCell(cell: string): string {
  const shown = cell.trim();
  return shown === '' ? 'an empty cell' : `"${shown.length > 30 ? shown.slice(0, 30) + '…' : shown}"`;
}

/** Parse a table of numbers. Throws InputError naming the offending line. */
export function parseTable(text: string, options: TableParseOptions = {}): ParsedTable {
  const source = options.source ?? 'data';
  const minColumns = options.minColumns ?? 1;
  const maxRows = options.maxRows ?? MAX_TABLE_ROWS;
  if (typeof text !== 'string' || text.trim() === '') {
    throw new InputError(source, 'no data: paste a table or choose a file');
  }
  const delimiter = detectDelimiter(text);
  const decimalComma = delimiter !== ',';
  const lines = sourceLines(text);

  let header: string[] | null = null;
  let headerLine: number | null = null;
  let columns = 0;
  const rows: number[][] = [];
  const rowLines: number[] = [];
  let seenFirst = false;

  for (let i = 0; i < lines.length; i++) {
    const raw = lines[i];
    if (isSkipped(raw)) continue;
    const lineNo = i + 1;
    const cells = splitLine(raw, delimiter);
    const values = cells.map((c) => parseCell(c, decimalComma));
    const bad = values.findIndex((v) => v === null);

    if (!seenFirst) {
      seenFirst = true;
      if (bad >= 0) {
        // First row with text in it: a header.
        header = cells.map((c) => c.trim());
        headerLine = lineNo;
        continue;
      }
    }
    if (bad >= 0) {
      throw new InputError(
        `${source} line ${lineNo}`,
        `column ${bad + 1} holds ${describeCell(cells[bad])}, which is not a number` +
          (delimiter === ',' && /\d,\d/.test(raw) ? ' (with comma-separated columns, write decimals with a point)' : ''),
      );
    }
    if (columns === 0) {
      columns = values.length;
      if (columns < minColumns) {
        throw new InputError(`${source} line ${lineNo}`, `has ${columns} column${columns === 1 ? '' : 's'}; at least ${minColumns} are needed`);
      }
    } else if (values.length !== columns) {
      throw new InputError(`${source} line ${lineNo}`, `has ${values.length} column${values.length === 1 ? '' : 's'} where the rows above have ${columns}`);
    }
    if (rows.length >= maxRows) {
      throw new InputError(source, `more than ${maxRows} data rows; split the data or thin it out`);
    }
    rows.push(values as number[]);
    rowLines.push(lineNo);
  }

  if (rows.length === 0) {
    throw new InputError(source, header ? 'only a header row was found, no numeric data' : 'no data rows found');
  }
  return { delimiter, decimalComma, header, headerLine, columns, rows, lines: rowLines };
}

export interface ColumnPair {
  /** 1-based column holding the current density. */
  currentColumn: number;
  /** 1-based column holding the potential. */
  potentialColumn: number;
}

export interface PolarizationTable {
  table: ParsedTable;
  /** Current density as written (user's unit), in row order. */
  currentDensity: number[];
  /** Potential as written (user's unit), in row order. */
  potential: number[];
  /** Header labels of the two columns used, when a header was found. */
  labels: { current: string | null; potential: string | null };
}

/** Parse a two-quantity polarization table (current density and potential columns). */
export function parsePolarizationTable(
  text: string,
  columns: ColumnPair = { currentColumn: 1, potentialColumn: 2 },
  options: TableParseOptions = {},
): PolarizationTable {
  const source = options.source ?? 'data';
  const { currentColumn, potentialColumn } = columns;
  if (currentColumn === potentialColumn) {
    throw new InputError('potentialColumn', 'current density and potential must come from different columns');
  }
  const need = Math.max(currentColumn, potentialColumn, 2);
  const table = parseTable(text, { ...options, source, minColumns: need });
  return {
    table,
    currentDensity: table.rows.map((r) => r[currentColumn - 1]),
    potential: table.rows.map((r) => r[potentialColumn - 1]),
    labels: {
      current: table.header?.[currentColumn - 1] ?? null,
      potential: table.header?.[potentialColumn - 1] ?? null,
    },
  };
}
