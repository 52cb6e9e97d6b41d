/**
 * Input handling of the kinetics page's form model (server/web/kinetics-view.ts), driven
 * without HTTP. Regressions: column-number fields were cut to 4 characters before being shown
 * back (a typed "1e300" came back as "1e30", a different number), and a UTF-16 data file was
 * read as UTF-8 garbage. Data are invented.
 */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../server/core/errors.js';
import type { Study } from '../../server/scenario/schema.js';
import { decodeDataFile, prepareFit, readForm } from '../../server/web/kinetics-view.js';
import { expectClose } from '../helpers/close.js';

/** prepareFit needs a study only for stored datasets; pasted and uploaded data need none. */
const NO_STUDY = { datasets: [] } as unknown as Study;

/** An invented Tafel line, η = 0.1 V·log10(j / 0.1 A/m²), as a CSV table with a header. */
const CSV = 'current density (A/m2),overpotential (V)\n' + [10, 30, 100, 300, 1000].map((j) => `${j},${(0.1 * Math.log10(j / 0.1)).toFixed(6)}`).join('\n') + '\n';

function pasteForm(extra: Record<string, string> = {}) {
  return readForm({ source: 'paste', data: CSV, temperatureC: '25', currentUnit: 'A/m2', potentialUnit: 'V', potentialKind: 'overpotential', model: 'tafel', ...extra });
}

/** Issues (label paths and messages) of the InputError `fn` throws. */
function issuesOf(fn: () => unknown): { path: string; message: string }[] {
  try {
    fn();
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return (e as InputError).issues;
  }
  throw new Error('expected an InputError');
}

/** UTF-16 bytes of `text` (little- or big-endian) with a byte-order mark. */
function utf16(text: string, endian: 'le' | 'be'): Uint8Array {
  const out = new Uint8Array(2 + 2 * text.length);
  out.set(endian === 'le' ? [0xff, 0xfe] : [0xfe, 0xff], 0);
  for (let k = 0; k < text.length; k++) {
    const c = text.charCodeAt(k);
    const [hi, lo] = [c >> 8, c & 0xff];
    out.set(endian === 'le' ? [lo, hi] : [hi, lo], 2 + 2 * k);
  }
  return out;
}

describe('column-number fields are shown back as typed', () => {
  it('"1e300" stays "1e300" (not "1e30") and is refused as a column number', () => {
    const form = pasteForm({ currentColumn: '1e300', potentialColumn: '12345' });
    expect(form.currentColumn).toBe('1e300');
    expect(form.potentialColumn).toBe('12345');
    const issues = issuesOf(() => prepareFit(form, NO_STUDY, undefined));
    expect(issues.find((i) => i.path === 'Current density column')?.message).toMatch(/at most 50/);
    expect(issues.find((i) => i.path === 'Potential column')?.message).toMatch(/at most 50/);
  });

  it('an over-long number text is marked as cut and refused, never read as a shorter number', () => {
    const long = '1'.repeat(60);
    const form = pasteForm({ temperatureC: long });
    expect(form.temperatureC).toBe(`${'1'.repeat(40)}…`);
    const issues = issuesOf(() => prepareFit(form, NO_STUDY, undefined));
    expect(issues.find((i) => i.path === 'Temperature (°C)')?.message).toMatch(/too long to be a number/);
  });

  it('ordinary column numbers still work', () => {
    const prepared = prepareFit(pasteForm({ currentColumn: '1', potentialColumn: '2' }), NO_STUDY, undefined);
    expect(prepared.input.points).toHaveLength(5);
    // η at 1000 A/m² = 0.1·log10(1e4) = 0.4 V (the line written above, 6 decimals).
    expectClose(prepared.input.points[4].overpotential, 0.4, { atol: 5e-7 }, 'η at 1000 A/m²');
  });
});

describe('decodeDataFile — UTF-8 and UTF-16 data files', () => {
  it('decodes UTF-16LE and UTF-16BE with a byte-order mark (WHATWG Encoding via TextDecoder)', () => {
    expect(decodeDataFile(utf16(CSV, 'le'))).toBe(CSV);
    expect(decodeDataFile(utf16(CSV, 'be'))).toBe(CSV);
  });

  it('reads UTF-8 with or without a byte-order mark', () => {
    const bytes = new TextEncoder().encode(CSV);
    expect(decodeDataFile(bytes)).toBe(CSV);
    expect(decodeDataFile(new Uint8Array([0xef, 0xbb, 0xbf, ...bytes]))).toBe(CSV);
  });

  it('refuses UTF-16 without a byte-order mark (NUL bytes) with a clear message on the file field', () => {
    const noBom = utf16(CSV, 'le').subarray(2);
    const issues = issuesOf(() => decodeDataFile(noBom));
    expect(issues[0].path).toBe('CSV file');
    expect(issues[0].message).toMatch(/UTF-16/);
  });

  it('a decoded UTF-16 file fits like the same table pasted', () => {
    const form = readForm({ source: 'file', temperatureC: '25', currentUnit: 'A/m2', potentialUnit: 'V', potentialKind: 'overpotential', model: 'tafel' });
    const fromFile = prepareFit(form, NO_STUDY, decodeDataFile(utf16(CSV, 'le')));
    const pasted = prepareFit(pasteForm(), NO_STUDY, undefined);
    expect(fromFile.input.points).toEqual(pasted.input.points);
  });

  it('UTF-16 text already read as UTF-8 (BOM → U+FFFD U+FFFD, NULs) is refused, not parsed as garbage', () => {
    const misread = Buffer.from(utf16(CSV, 'le')).toString('utf8');
    const form = readForm({ source: 'file', temperatureC: '25', currentUnit: 'A/m2', potentialUnit: 'V', potentialKind: 'overpotential', model: 'tafel' });
    const issues = issuesOf(() => prepareFit(form, NO_STUDY, misread));
    const issue = issues.find((i) => i.path === 'CSV file');
    expect(issue, JSON.stringify(issues)).toBeDefined();
    expect(issue!.message).toMatch(/UTF-16 text read as UTF-8/);
  });
});
