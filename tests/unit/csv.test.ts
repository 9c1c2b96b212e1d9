/**
 * The server's one CSV writer (server/csv.ts) against RFC 4180 ("Common Format and MIME Type
 * for Comma-Separated Values (CSV) Files", IETF, 2005, §2) and read back with csv-parse, a
 * reference parser from npm, which must give every field back exactly.
 */
import { describe, expect, it } from 'vitest';
import { parse } from 'csv-parse/sync';
import fc from 'fast-check';
import { csvField, csvRecord, safeFileName, toCsv } from '../../server/csv';

/** csv-parse in strict RFC 4180 reading: no relaxed quotes, every record the same width. */
function parseRfc4180(text: string): string[][] {
  return parse(text, { relax_quotes: false, relax_column_count: false, record_delimiter: '\r\n', bom: false }) as string[][];
}

/** What a spreadsheet reads back: a text the formula guard applies to, with its apostrophe in front. */
const guarded = (s: string) => (/^[=+\-@\t\r]/.test(s) && !/^[+-]?(\d+(\.\d*)?|\.\d+)$/.test(s) ? `'${s}` : s);

describe('CSV writer (RFC 4180 §2)', () => {
  it('leaves a plain field as it is (RFC 4180 §2 rule 5: quotes are optional)', () => {
    expect(csvField('Adhesive A')).toBe('Adhesive A');
    expect(csvField(12.5)).toBe('12.5');
    expect(csvField(null)).toBe('');
    expect(csvField(undefined)).toBe('');
  });

  it('encloses a field holding a comma, a double quote, CR or LF in double quotes (RFC 4180 §2 rule 6)', () => {
    expect(csvField('a,b')).toBe('"a,b"');
    expect(csvField('line 1\r\nline 2')).toBe('"line 1\r\nline 2"');
    // A lone LF or CR is a line break to every spreadsheet: quoted too.
    expect(csvField('line 1\nline 2')).toBe('"line 1\nline 2"');
    expect(csvField('line 1\rline 2')).toBe('"line 1\rline 2"');
  });

  it('doubles a double quote inside a quoted field (RFC 4180 §2 rule 7)', () => {
    expect(csvField('say "hi"')).toBe('"say ""hi"""');
    expect(csvField('"')).toBe('""""');
  });

  it('ends every record, the last one too, with CRLF and separates fields by commas (RFC 4180 §2 rules 1, 2 and 4)', () => {
    expect(csvRecord(['a', 'b', null])).toBe('a,b,\r\n');
    expect(
      toCsv([
        ['h1', 'h2'],
        ['x', 'y'],
      ]),
    ).toBe('h1,h2\r\nx,y\r\n');
  });

  it('guards text a spreadsheet would run as a formula with a leading apostrophe (OWASP "CSV Injection")', () => {
    expect(csvField('=HYPERLINK("http://example.invalid","x")')).toBe(`"'=HYPERLINK(""http://example.invalid"",""x"")"`);
    expect(csvField('+1+cmd')).toBe("'+1+cmd");
    expect(csvField("-2+3+cmd|' /C calc'!A0")).toBe("'-2+3+cmd|' /C calc'!A0");
    expect(csvField('@SUM(A1:A2)')).toBe("'@SUM(A1:A2)");
    expect(csvField('\t=1')).toBe("'\t=1");
    expect(csvField('\r=1')).toBe(`"'\r=1"`);
    // A number, or text that is only a plain number, is a value and not a formula: a negative
    // temperature stays a number in the spreadsheet.
    expect(csvField(-3.5)).toBe('-3.5');
    expect(csvField('-3.5')).toBe('-3.5');
    expect(csvField('+2')).toBe('+2');
    expect(csvField('-')).toBe("'-");
  });

  it('reads back with csv-parse exactly, header and awkward fields included (round trip)', () => {
    const rows = [
      ['Supplier lot', 'Notes', 'Received (plant time, Europe/Berlin)'],
      ['L-1,2', 'He said "keep cold"', '2026-12-02 07:25'],
      ['multi\r\nline', 'lone\nLF and lone\rCR', ''],
      ['ünïcödé °C µm', '  spaces kept  ', '""'],
    ];
    expect(parseRfc4180(toCsv(rows))).toEqual(rows);
  });

  it('round-trips any text through csv-parse (property, fast-check)', () => {
    const cell = fc.string({
      unit: fc.constantFrom('a', 'Z', '0', '.', ',', '"', '\r', '\n', ' ', 'é', ';', "'", '=', '-', '+', '@', '\t'),
    });
    fc.assert(
      fc.property(fc.array(fc.array(cell, { minLength: 3, maxLength: 3 }), { minLength: 1, maxLength: 6 }), (rows) => {
        const parsed = parseRfc4180(toCsv(rows));
        expect(parsed).toEqual(rows.map((r) => r.map(guarded)));
      }),
    );
  });

  it('keeps file names to letters, digits, dot, dash and underscore', () => {
    expect(safeFileName('HB-12 "rev" 2/3')).toBe('HB-12_rev_2_3');
    expect(safeFileName('...')).toBe('export');
  });
});
