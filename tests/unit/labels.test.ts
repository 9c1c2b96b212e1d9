import { createRequire } from 'node:module';
import QRCode from 'qrcode';
import { describe, expect, it } from 'vitest';
import { findLayout, labelLayouts } from '../../server/services/labels/templates';
import {
  PT_MM,
  escapeHtml,
  pictogramSizeMm,
  renderLabelsHtml,
  textColumnMm,
  useByText,
  type LabelData,
} from '../../server/services/labels/render';
import { qrSvg } from '../../server/services/labels/qr';
import {
  CROCKFORD_ALPHABET,
  containerCodeFromBody,
  crockfordCheckSymbol,
  isValidContainerCode,
  normalizeContainerCode,
} from '../../shared/schemas/containers';

const EPS = 1e-9;
const layout = (id: string) => {
  const l = findLayout(id);
  if (!l) throw new Error(`no layout ${id}`);
  return l;
};

describe('label layouts', () => {
  it('every layout grid fits its page: margins + cols·w + gaps ≤ page width, and the same down the page', () => {
    const all = labelLayouts();
    expect(all.length).toBeGreaterThanOrEqual(4);
    for (const l of all) {
      const width = l.marginsMm.left + l.grid.cols * l.label.widthMm + (l.grid.cols - 1) * l.gapMm.col + l.marginsMm.right;
      const height = l.marginsMm.top + l.grid.rows * l.label.heightMm + (l.grid.rows - 1) * l.gapMm.row + l.marginsMm.bottom;
      expect(width, l.id).toBeLessThanOrEqual(l.page.widthMm + EPS);
      expect(height, l.id).toBeLessThanOrEqual(l.page.heightMm + EPS);
      // The QR code and the padding fit inside one label.
      expect(l.qr.sizeMm + 2 * l.paddingMm, l.id).toBeLessThanOrEqual(l.label.heightMm);
    }
  });

  it('thermal labels are exactly their nominal size, one label per page', () => {
    // 50 × 25 mm and 100 × 50 mm are usual thermal roll sizes (common practice).
    for (const [id, w, h] of [
      ['thermal-50x25', 50, 25],
      ['thermal-100x50', 100, 50],
    ] as const) {
      const l = layout(id);
      expect(l.kind).toBe('thermal');
      expect(l.label).toMatchObject({ widthMm: w, heightMm: h });
      expect(l.page).toEqual({ widthMm: w, heightMm: h });
      expect(l.grid).toEqual({ cols: 1, rows: 1 });
    }
  });

  it('A4 is 210 × 297 mm (ISO 216) and US Letter 215.9 × 279.4 mm (ANSI/ASME Y14.1, 8.5 × 11 in at 25.4 mm/in)', () => {
    expect(layout('a4-3x8-70x37').page).toEqual({ widthMm: 210, heightMm: 297 });
    // ISO 216: A-series sides are in the ratio 1 : √2 (to the nearest millimetre).
    expect(Math.round(210 * Math.SQRT2)).toBe(297);
    const letter = layout('letter-3x10-66-7x25-4').page;
    expect(letter.widthMm).toBeCloseTo(8.5 * 25.4, 9);
    expect(letter.heightMm).toBeCloseTo(11 * 25.4, 9);
  });

  it('the common sheet formats fill their sheets: 3 × 8 of 70 × 37 mm on A4, 3 × 10 of 66.7 × 25.4 mm on Letter', () => {
    // Common practice: A4 sheets of 24 labels 70 × 37 mm; Letter sheets of 30 labels 2⅝ × 1 in
    // with ½ in top and bottom margins and ⅛ in between columns.
    const a4 = layout('a4-3x8-70x37');
    expect(a4.grid).toEqual({ cols: 3, rows: 8 });
    expect(a4.label).toMatchObject({ widthMm: 70, heightMm: 37 });
    expect(a4.marginsMm.left + 3 * 70 + a4.marginsMm.right).toBeCloseTo(210, 9);
    const letter = layout('letter-3x10-66-7x25-4');
    expect(letter.grid).toEqual({ cols: 3, rows: 10 });
    expect(letter.label).toMatchObject({ widthMm: 66.7, heightMm: 25.4 });
    expect(letter.marginsMm.top).toBeCloseTo(0.5 * 25.4, 9);
    expect(letter.gapMm.col).toBeCloseTo(25.4 / 8, 9);
    expect(letter.marginsMm.left + 3 * 66.7 + 2 * letter.gapMm.col + letter.marginsMm.right).toBeCloseTo(215.9, 9);
    expect(letter.marginsMm.top + 10 * 25.4 + letter.marginsMm.bottom).toBeCloseTo(279.4, 9);
  });

  it('the text lines and the hazard row fit the label height', () => {
    // 1 pt = 1/72 in (desktop-publishing point); the renderer sets a line height of 1.15.
    expect(PT_MM * 72).toBeCloseTo(25.4, 12);
    for (const l of labelLayouts()) {
      const inner = l.label.heightMm - 2 * l.paddingMm;
      const title = 2 * l.fontPt.title * PT_MM * 1.15; // the title may take two lines
      const body = (l.lines.length - 1) * l.fontPt.body * PT_MM * 1.15;
      const hazards = l.pictogram.sizeMm + 0.5;
      expect(title + body + hazards, l.id).toBeLessThanOrEqual(inner);
      // Four pictograms and the signal word fit in one row at full size (most adhesives carry 1–3).
      expect(pictogramSizeMm(l, 4, 'Danger'), l.id).toBeCloseTo(l.pictogram.sizeMm, 9);
      expect(pictogramSizeMm(l, 9, 'Warning') * 9, l.id).toBeLessThanOrEqual(2 * textColumnMm(l));
    }
  });
});

describe('QR code', () => {
  const code = containerCodeFromBody('4D7QX2MB');

  it('a container code fits a version-1 symbol at level M, with a 4-module quiet zone', async () => {
    // ISO/IEC 18004: version V has 17 + 4V modules a side (version 1: 21); version 1-M holds
    // 20 alphanumeric characters; the quiet zone is 4 modules wide.
    expect(code).toHaveLength(13);
    const qr = QRCode.create(code, { errorCorrectionLevel: 'M' });
    expect(qr.version).toBe(1);
    expect(qr.modules.size).toBe(17 + 4 * 1);
    const svg = await qrSvg(code);
    expect(svg).toContain(`viewBox="0 0 ${21 + 2 * 4} ${21 + 2 * 4}"`);
    // 21 alphanumeric characters exceed version 1-M (20), so the symbol grows to version 2 (25 modules).
    expect(QRCode.create('TLC-1234567890ABCDEFG', { errorCorrectionLevel: 'M' }).modules.size).toBe(25);
  });

  it('the SVG on the label decodes back to the code (ZXing reader)', async () => {
    const svg = await qrSvg(code);
    expect(decodeQrSvg(svg)).toBe(code);
  });
});

describe('container codes', () => {
  it('the check symbol catches every single-symbol mistake (Luhn mod N property)', () => {
    // Luhn mod N algorithm: any single substituted character changes the check sum.
    for (const body of ['4D7QX2MB', '00000000', 'ZZZZZZZZ', 'K9V2M0QA']) {
      const good = containerCodeFromBody(body);
      expect(isValidContainerCode(good)).toBe(true);
      const check = crockfordCheckSymbol(body);
      for (let i = 0; i < body.length; i++) {
        for (const symbol of CROCKFORD_ALPHABET) {
          if (symbol === body[i]) continue;
          const typo = body.slice(0, i) + symbol + body.slice(i + 1);
          expect(isValidContainerCode(`TLC-${typo}${check}`), `${body} → ${typo}`).toBe(false);
        }
      }
    }
  });

  it('reads Crockford look-alikes as Crockford says (i, l → 1; o → 0; any case)', () => {
    // Crockford's Base32 (crockford.com/base32.html): decode I and L as 1, O as 0, accept lower case.
    expect(normalizeContainerCode(' tlc-1o0l i ')).toBe('TLC-10011');
    expect(normalizeContainerCode('tlc4d7qx2mb1')).toBe('TLC-4D7QX2MB1');
    expect(CROCKFORD_ALPHABET).toHaveLength(32);
    expect(CROCKFORD_ALPHABET).not.toMatch(/[ILOU]/);
  });
});

describe('rendered HTML', () => {
  const sample = (over: Partial<LabelData> = {}): LabelData => ({
    code: containerCodeFromBody('4D7QX2MB'),
    seq: 2,
    total: 5,
    materialName: 'Dust-cap adhesive',
    materialCode: 'ADH-DC-12',
    supplierName: 'Brackwater Resins',
    supplierLot: 'K-77',
    receivedAt: '2026-03-04T08:00:00.000Z',
    quantity: 300,
    unit: 'g',
    storageClass: 'ambient',
    effectiveExpiry: '2026-09-01T00:00:00.000Z',
    hazards: { signalWord: 'Warning', pictograms: ['GHS07'] },
    ...over,
  });

  it('sets the physical page and label sizes in millimetres', async () => {
    const thermal = await renderLabelsHtml(layout('thermal-50x25'), [sample()], { zone: 'UTC' });
    expect(thermal).toContain('@page { size: 50mm 25mm; margin: 0; }');
    expect(thermal).toContain('.label { width: 50mm; height: 25mm;');
    const letter = await renderLabelsHtml(layout('letter-3x10-66-7x25-4'), [sample()], { zone: 'UTC' });
    expect(letter).toContain('@page { size: 215.9mm 279.4mm; margin: 0; }');
    expect(letter).toContain('grid-template-columns: repeat(3, 66.7mm); grid-template-rows: repeat(10, 25.4mm)');
    expect(letter).toContain('padding: 12.7mm 4.725mm 12.7mm 4.725mm');
    expect(letter).toContain('column-gap: 3.175mm');
  });

  it('breaks sheets into pages and honours skipped positions', async () => {
    const a4 = layout('a4-3x8-70x37');
    const labels = Array.from({ length: 30 }, (_, i) => sample({ seq: i + 1, total: 30 }));
    const html = await renderLabelsHtml(a4, labels, { zone: 'UTC', skip: 20 });
    expect((html.match(/<section class="page">/g) ?? []).length).toBe(Math.ceil((20 + 30) / 24));
    expect((html.match(/class="label empty"/g) ?? []).length).toBe(20);
  });

  it('escapes every text and prints dates in the plant zone', async () => {
    const html = await renderLabelsHtml(
      layout('thermal-100x50'),
      [sample({ materialName: '<img src=x onerror=alert(1)>', supplierLot: 'A&B"1\'' })],
      { zone: 'Europe/Berlin' },
    );
    expect(html).not.toContain('<img');
    expect(html).toContain('&lt;img src=x onerror=alert(1)&gt;');
    expect(html).toContain('Lot A&amp;B&quot;1&#39;');
    expect(escapeHtml(`<>&"'`)).toBe('&lt;&gt;&amp;&quot;&#39;');
    // 2026-09-01T00:00Z is 02:00 in Berlin (CEST, UTC+2): not a day boundary there, so the time is printed.
    expect(html).toContain('Use before 2026-09-01 02:00');
  });

  it('an expiry at the start of a day prints as the last usable day', () => {
    expect(useByText('2026-09-01T00:00:00.000Z', 'UTC')).toBe('Use by 2026-08-31');
    expect(useByText('2026-08-31T22:00:00.000Z', 'Europe/Berlin')).toBe('Use by 2026-08-31');
    expect(useByText(null, 'UTC')).toBe('No expiry date');
  });

  it('shows every GHS pictogram and the signal word for hazardous material, none for other material', async () => {
    const all = ['GHS01', 'GHS02', 'GHS03', 'GHS04', 'GHS05', 'GHS06', 'GHS07', 'GHS08', 'GHS09'];
    const html = await renderLabelsHtml(layout('thermal-50x25'), [sample({ hazards: { signalWord: 'Danger', pictograms: all } })], {
      zone: 'UTC',
    });
    for (const p of all) expect(html).toContain(`title="${p}"`);
    expect(html).toContain('<span class="signal">Danger</span>');
    // Each pictogram is a red-bordered diamond (UN GHS Annex 3: black symbol, white background, red frame).
    expect((html.match(/stroke="#e3001b"/g) ?? []).length).toBe(9);
    const plain = await renderLabelsHtml(layout('thermal-50x25'), [sample({ hazards: { pictograms: [] } })], { zone: 'UTC' });
    expect(plain).not.toContain('class="hazards"');
    expect(plain).not.toContain('safety data sheet');
  });
});

/** Rasterises qrcode's SVG path (one `h` run per dark stretch) and decodes it with ZXing. */
function decodeQrSvg(svg: string): string {
  const require = createRequire(import.meta.url);
  // ZXing's reader ships with html5-qrcode (an installed dependency) as a UMD bundle.
  const ZXing = require('html5-qrcode/third_party/zxing-js.umd.js');
  const size = Number(/viewBox="0 0 (\d+) \d+"/.exec(svg)?.[1]);
  const d = /<path stroke="#000000" d="([^"]+)"/.exec(svg)?.[1] ?? '';
  const scale = 4;
  const w = size * scale;
  const pixels = new Uint8ClampedArray(w * w).fill(255);
  let x = 0;
  let y = 0;
  for (const [, op, args] of d.matchAll(/([Mmh])([^Mmh]*)/g)) {
    const nums = args
      .trim()
      .split(/[\s,]+/)
      .filter(Boolean)
      .map(Number);
    if (op === 'M') [x, y] = nums;
    else if (op === 'm') {
      x += nums[0];
      y += nums[1];
    } else {
      const row = Math.floor(y);
      for (let c = x; c < x + nums[0]; c++) {
        for (let a = 0; a < scale; a++) for (let b = 0; b < scale; b++) pixels[(row * scale + a) * w + c * scale + b] = 0;
      }
      x += nums[0];
    }
  }
  const source = new ZXing.RGBLuminanceSource(pixels, w, w);
  const bitmap = new ZXing.BinaryBitmap(new ZXing.HybridBinarizer(source));
  return new ZXing.QRCodeReader().decode(bitmap).getText();
}
