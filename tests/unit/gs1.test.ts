import { describe, expect, it } from 'vitest';
import {
  Gs1Error,
  gs1Century,
  gtinCheckDigit,
  isValidGtin,
  looksLikeGs1,
  parseGs1,
  parseGs1Date,
  toDigitalLink,
  toElementString,
} from '../../shared/gs1';

const GS = '\u001d';
const NOW = new Date('2025-06-15T12:00:00Z');

function gs1Error(fn: () => unknown): Gs1Error {
  try {
    fn();
  } catch (e) {
    if (e instanceof Gs1Error) return e;
    throw e;
  }
  throw new Error('expected a Gs1Error, nothing was thrown');
}

describe('GTIN check digit', () => {
  it('matches the worked example on gs1.org', () => {
    // gs1.org "How to calculate a check digit manually": 629104150021 -> sum 57 -> check digit 3
    expect(gtinCheckDigit('629104150021')).toBe(3);
    expect(isValidGtin('6291041500213')).toBe(true);
  });

  it('accepts published valid GTINs of every length', () => {
    // GS1 General Specifications / GS1 Digital Link examples
    expect(isValidGtin('09521234543213')).toBe(true);
    expect(isValidGtin('09506000134352')).toBe(true);
    // UPC-A 036000241457 (GS1 US / Wikipedia "Universal Product Code" example)
    expect(isValidGtin('036000241457')).toBe(true);
    // EAN-13 of ISBN 978-0-306-40615-7 (Wikipedia "ISBN", check digit worked example)
    expect(isValidGtin('9780306406157')).toBe(true);
    // EAN-8 96385074 (Wikipedia "EAN-8" example)
    expect(isValidGtin('96385074')).toBe(true);
  });

  it('rejects a changed digit, wrong lengths and non-digits', () => {
    expect(isValidGtin('09521234543214')).toBe(false);
    expect(isValidGtin('9780306406158')).toBe(false);
    expect(isValidGtin('952123454321')).toBe(false); // 12 digits, check digit wrong
    expect(isValidGtin('0952123454321')).toBe(false);
    expect(isValidGtin('123456789')).toBe(false); // 9 digits: no such GTIN length
    expect(isValidGtin('0952123454321A')).toBe(false);
    expect(() => gtinCheckDigit('12a')).toThrow(Gs1Error);
  });
});

describe('dates (GS1 General Specifications)', () => {
  it('reads day 00 as the last day of the month', () => {
    // GS1 General Specifications: 130200 means 2013-02-28
    expect(parseGs1Date('130200', 'expiresOn', NOW)).toBe('2013-02-28');
    // same rule, leap year (Gregorian calendar): February 2024 has 29 days
    expect(parseGs1Date('240200', 'expiresOn', NOW)).toBe('2024-02-29');
    expect(parseGs1Date('251100', 'expiresOn', NOW)).toBe('2025-11-30');
  });

  it('chooses the century per §7.12', () => {
    // GS1 General Specifications §7.12: YY − current YY in 51..99 -> previous century,
    // -99..-50 -> next century, otherwise current century.
    expect(gs1Century(75, NOW)).toBe(2075); // difference 50
    expect(gs1Century(76, NOW)).toBe(1976); // difference 51
    expect(gs1Century(0, NOW)).toBe(2000);
    const late = new Date('2080-01-01T00:00:00Z');
    expect(gs1Century(31, late)).toBe(2031); // difference -49
    expect(gs1Century(30, late)).toBe(2130); // difference -50
    expect(gs1Century(20, late)).toBe(2120);
    expect(parseGs1('(17)990101', NOW).expiresOn).toBe('1999-01-01');
    expect(parseGs1('(17)990101', new Date('2060-01-01T00:00:00Z')).expiresOn).toBe('2099-01-01');
  });

  it('refuses impossible dates, naming the field', () => {
    expect(gs1Error(() => parseGs1('(01)09521234543213(17)261331', NOW)).field).toBe('expiresOn'); // month 13
    expect(gs1Error(() => parseGs1('(17)260132', NOW)).field).toBe('expiresOn'); // day 32
    expect(gs1Error(() => parseGs1('(17)250230', NOW)).field).toBe('expiresOn'); // 30 February
    expect(gs1Error(() => parseGs1('(11)250001', NOW)).field).toBe('producedOn'); // month 00
    expect(gs1Error(() => parseGs1('(17)2612', NOW)).field).toBe('expiresOn'); // too short
  });
});

describe('parseGs1: human-readable element strings', () => {
  it('reads the GS1 example with parentheses', () => {
    // references.md: (01)09521234543213(17)261231(10)ABC123 (GS1 General Specifications form)
    const r = parseGs1('(01)09521234543213(17)261231(10)ABC123', NOW);
    expect(r.gtin).toBe('09521234543213');
    expect(r.expiresOn).toBe('2026-12-31');
    expect(r.lot).toBe('ABC123');
    expect(r.elements).toEqual([
      { ai: '01', value: '09521234543213' },
      { ai: '17', value: '261231' },
      { ai: '10', value: 'ABC123' },
    ]);
  });

  it('reads production date, serial, count, SSCC and company-internal fields', () => {
    // SSCC 006141411234567890: GS1 General Specifications / GS1 US SSCC example
    const r = parseGs1('(00)006141411234567890(11)250300(21)S-0001(30)12(91)SHELF-B', NOW);
    expect(r.producedOn).toBe('2025-03-31');
    expect(r.serial).toBe('S-0001');
    expect(r.count).toBe(12);
    expect(r.elements.find((e) => e.ai === '91')?.value).toBe('SHELF-B');
    // a space is not in GS1 AI encodable character set 82 (GS1 General Specifications)
    expect(gs1Error(() => parseGs1('(91)SHELF B', NOW)).field).toBe('internal');
  });

  it('tolerates spaces between elements', () => {
    const r = parseGs1(' (01) 09521234543213 (10) L-42 \r\n', NOW);
    expect(r).toMatchObject({ gtin: '09521234543213', lot: 'L-42' });
  });
});

describe('parseGs1: raw scanner data', () => {
  it('ends variable fields with GS and ignores symbology identifiers and a leading FNC1', () => {
    const raw = `0109521234543213` + `10ABC123${GS}` + `17261231` + `2112345`;
    for (const prefix of ['', ']C1', ']d2', ']Q3', GS, `]d2${GS}`]) {
      const r = parseGs1(prefix + raw, NOW);
      expect(r).toMatchObject({ gtin: '09521234543213', lot: 'ABC123', expiresOn: '2026-12-31', serial: '12345' });
    }
  });

  it('needs no separator after predefined-length AIs', () => {
    // GS1 General Specifications, predefined-length table: 01 (16), 17 (8) need no FNC1
    const r = parseGs1('010952123454321317261231' + '11250101' + '10LOT-7', NOW);
    expect(r).toMatchObject({ gtin: '09521234543213', expiresOn: '2026-12-31', producedOn: '2025-01-01', lot: 'LOT-7' });
  });

  it('reads 4-digit AIs, 240, 400 and 37', () => {
    const r = parseGs1(`01095212345432133103000500240PART-9${GS}400PO-77${GS}3724`, NOW);
    expect(r.elements.map((e) => e.ai)).toEqual(['01', '3103', '240', '400', '37']);
    expect(r.count).toBe(24);
  });

  it('refuses a wrong GTIN check digit with the expected digit', () => {
    const e = gs1Error(() => parseGs1('0109521234543214' + '10ABC', NOW));
    expect(e.field).toBe('gtin');
    expect(e.message).toMatch(/expected 3, got 4/);
    expect(gs1Error(() => parseGs1('(02)09521234543214', NOW)).field).toBe('gtin');
    expect(gs1Error(() => parseGs1('(00)006141411234567891', NOW)).field).toBe('sscc');
  });

  it('refuses unknown AIs, bad lengths, non-digits, over-long and empty input', () => {
    expect(gs1Error(() => parseGs1('(01)09521234543213(8200)https', NOW)).field).toBe('input');
    expect(gs1Error(() => parseGs1('01095212345432137030ABC', NOW)).field).toBe('input');
    expect(gs1Error(() => parseGs1('(01)0952123454321', NOW)).field).toBe('gtin'); // 13 digits
    expect(gs1Error(() => parseGs1(`010952123454321${GS}10A`, NOW)).field).toBe('gtin');
    expect(gs1Error(() => parseGs1('(01)0952123454321A', NOW)).field).toBe('gtin');
    expect(gs1Error(() => parseGs1('(30)12a', NOW)).field).toBe('count');
    const long = gs1Error(() => parseGs1('(10)ABCDEFGHIJKLMNOPQRSTU', NOW)); // 21 > X..20
    expect(long.field).toBe('lot');
    expect(long.message).toMatch(/at most 20/);
    expect(parseGs1(`(10)${'x'.repeat(20)}`, NOW).lot).toHaveLength(20);
    expect(gs1Error(() => parseGs1('(10)', NOW)).field).toBe('lot');
    expect(gs1Error(() => parseGs1('', NOW)).field).toBe('input');
    expect(gs1Error(() => parseGs1(`  ${GS}`, NOW)).field).toBe('input');
    expect(gs1Error(() => parseGs1('(10)A(10)B', NOW)).message).toMatch(/twice/);
  });
});

describe('parseGs1: element strings in any order', () => {
  // GS1 General Specifications §5.10 / §7.8: element strings may be concatenated in any order;
  // only the predefined-length AIs (table "Element strings with predefined length using GS1
  // Application Identifiers") need no FNC1 after them, every other field that is not last ends
  // with FNC1 (sent by scanners as GS, ASCII 29). The GTIN need not come first.
  const expected = { gtin: '09521234543213', lot: 'ABC123', expiresOn: '2028-02-29' };

  it('reads a raw string that starts with the expiry date (17) and then the GTIN', () => {
    // 280200: day 00 = last day of February 2028, a leap year (GS1 General Specifications).
    const raw = '17280200' + '0109521234543213' + '10ABC123';
    expect(parseGs1(raw, NOW)).toMatchObject(expected);
    expect(parseGs1(raw, NOW).elements.map((e) => e.ai)).toEqual(['17', '01', '10']);
    expect(looksLikeGs1(raw)).toBe(true);
  });

  it('reads every order of the same elements, raw with GS, bracketed, and behind each symbology identifier', () => {
    const parts = ['0109521234543213', '17280200', `10ABC123`, '11250101'];
    const orders = [
      [0, 1, 2, 3],
      [1, 0, 3, 2],
      [3, 2, 1, 0],
      [2, 3, 0, 1],
      [1, 3, 2, 0],
    ];
    for (const order of orders) {
      // A variable-length field (10) that is not last is followed by GS.
      const raw = order.map((i, k) => (i === 2 && k < order.length - 1 ? `${parts[i]}${GS}` : parts[i])).join('');
      const bracketed = order.map((i) => `(${parts[i].slice(0, 2)})${parts[i].slice(2)}`).join('');
      for (const prefix of ['', ']C1', ']d2', ']Q3', ']e0', ']J1', GS, `]C1${GS}`]) {
        const r = parseGs1(prefix + raw, NOW);
        expect(r, JSON.stringify(prefix + raw)).toMatchObject({ ...expected, producedOn: '2025-01-01' });
        expect(r.elements.map((e) => e.ai)).toEqual(order.map((i) => parts[i].slice(0, 2)));
        expect(looksLikeGs1(prefix + raw)).toBe(true);
      }
      expect(parseGs1(bracketed, NOW)).toMatchObject({ ...expected, producedOn: '2025-01-01' });
    }
  });

  it('accepts a redundant GS after a predefined-length field and reads serial, count and weight in any order', () => {
    const r = parseGs1(`21SN-4${GS}17280200${GS}3103001250` + `0109521234543213` + `3012`, NOW);
    expect(r).toMatchObject({ gtin: '09521234543213', serial: 'SN-4', expiresOn: '2028-02-29', count: 12 });
    expect(r.elements.map((e) => e.ai)).toEqual(['21', '17', '3103', '01', '30']);
  });

  it('still checks each element wherever it stands', () => {
    expect(gs1Error(() => parseGs1('17280200' + '0109521234543214' + '10ABC', NOW)).field).toBe('gtin');
    expect(gs1Error(() => parseGs1('17281300' + '0109521234543213', NOW)).field).toBe('expiresOn');
    // 17 is predefined-length: a short date runs into the next AI and is refused, not misread.
    expect(gs1Error(() => parseGs1(`172802${GS}0109521234543213`, NOW)).field).toBe('expiresOn');
  });

  it('reads a Digital Link behind a symbology identifier and with its attributes in any query order', () => {
    // GS1 Digital Link URI syntax 1.2: data attributes go in the query string, in any order.
    const r = parseGs1(']Q1https://id.gs1.org/01/09521234543213/10/ABC123?11=250101&17=280200', NOW);
    expect(r).toMatchObject({ ...expected, producedOn: '2025-01-01' });
    expect(parseGs1('https://id.gs1.org/01/09521234543213/10/ABC123?17=280200&11=250101', NOW)).toMatchObject(expected);
    expect(looksLikeGs1(']Q1https://id.gs1.org/01/09521234543213')).toBe(true);
  });
});

describe('GS1 Digital Link', () => {
  const EXAMPLE = 'https://id.gs1.org/01/09521234543213/10/ABC123?17=261231';

  it('reads the GS1 Digital Link 1.2 example', () => {
    // GS1 Digital Link URI syntax 1.2 example (references.md)
    expect(parseGs1(EXAMPLE, NOW)).toMatchObject({ gtin: '09521234543213', lot: 'ABC123', expiresOn: '2026-12-31' });
  });

  it('allows a path prefix, percent-encoding, serials and non-AI query keys', () => {
    const r = parseGs1('https://labels.example.test/plant/a/01/09506000134352/10/AB%2F1%25/21/S-9?17=260300&linkType=all', NOW);
    expect(r).toMatchObject({ gtin: '09506000134352', lot: 'AB/1%', serial: 'S-9', expiresOn: '2026-03-31' });
    // a space is not a GS1 character (set 82), so a serial with one is refused
    expect(gs1Error(() => parseGs1('https://l.example.test/01/09506000134352/21/S%20', NOW)).field).toBe('serial');
  });

  it('expands a GTIN-13 in the path to 14 digits (GS1 Digital Link URI syntax)', () => {
    expect(parseGs1('https://d.example.test/01/9780306406157', NOW).gtin).toBe('09780306406157');
  });

  it('refuses a wrong check digit or a link without a primary key', () => {
    expect(gs1Error(() => parseGs1('https://id.gs1.org/01/09521234543214/10/A', NOW)).field).toBe('gtin');
    expect(gs1Error(() => parseGs1('https://id.gs1.org/10/ABC', NOW)).field).toBe('input');
    expect(gs1Error(() => parseGs1('https://id.gs1.org/01/09521234543213?17=261331', NOW)).field).toBe('expiresOn');
  });

  it('builds the same URI as the standard example and round-trips awkward lots', () => {
    expect(toDigitalLink({ gtin: '09521234543213', lot: 'ABC123', expiresOn: '2026-12-31' })).toBe(EXAMPLE);
    const uri = toDigitalLink({ gtin: '6291041500213', lot: 'A/B?C&D%', serial: '7+1' }, 'tl.example.test/x/');
    expect(uri).toBe('https://tl.example.test/x/01/06291041500213/10/A%2FB%3FC%26D%25/21/7%2B1');
    expect(parseGs1(uri, NOW)).toMatchObject({ gtin: '06291041500213', lot: 'A/B?C&D%', serial: '7+1' });
    expect(gs1Error(() => toDigitalLink({ gtin: '09521234543214' })).message).toMatch(/expected 3, got 4/);
    expect(gs1Error(() => toDigitalLink({ gtin: '09521234543213', lot: 'x'.repeat(21) })).field).toBe('lot');
  });

  it('builds a human-readable element string that parses back', () => {
    const s = toElementString({ gtin: '09521234543213', lot: 'ABC123', expiresOn: '2026-12-31' });
    expect(s).toBe('(01)09521234543213(17)261231(10)ABC123');
    expect(parseGs1(s, NOW).expiresOn).toBe('2026-12-31');
  });
});

describe('looksLikeGs1', () => {
  it('recognises the GS1 forms and nothing else', () => {
    expect(looksLikeGs1('(01)09521234543213')).toBe(true);
    expect(looksLikeGs1(']C10109521234543213')).toBe(true);
    expect(looksLikeGs1(`10ABC${GS}17261231`)).toBe(true);
    expect(looksLikeGs1('0109521234543213')).toBe(true);
    expect(looksLikeGs1('https://id.gs1.org/01/09521234543213/10/ABC123')).toBe(true);
    expect(looksLikeGs1('https://x.example.test/c/7f3a')).toBe(false);
    expect(looksLikeGs1('TL-C-000123')).toBe(false);
    expect(looksLikeGs1('010952')).toBe(false);
    // Not GS1: one short numeric element, a serial-like number, a non-GS1 symbology with our own code.
    expect(looksLikeGs1('17280200')).toBe(false);
    expect(looksLikeGs1('123456789')).toBe(false);
    expect(looksLikeGs1(']Q1TL-C-000123')).toBe(false);
    expect(looksLikeGs1(']C1')).toBe(true); // a GS1 symbology: parseGs1 then says it is empty
    expect(looksLikeGs1('')).toBe(false);
  });
});
