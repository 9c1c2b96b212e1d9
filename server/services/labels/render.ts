/**
 * Print-ready HTML for container labels. Every size is in millimetres and the page size is set
 * with `@page { size: … }`, so a browser printing at 100 % ("actual size", no margins) puts each
 * label where the label stock has it. Pure apart from reading the templates; no database.
 */
import { DateTime } from 'luxon';
import { GHS_PICTOGRAMS, type GhsPictogram, type StorageClass } from '../../../shared/constants';
import type { LabelField, LabelLayout } from '../../../shared/schemas/labels';
import { formatDate, formatDateTime } from '../../../shared/plant-time';
import { ghsSvg } from './templates';
import { qrSvg } from './qr';

/** What one container label shows. */
export interface LabelData {
  code: string;
  seq: number;
  total: number;
  materialName: string;
  materialCode: string;
  supplierName: string;
  supplierLot: string;
  /** ISO instant */
  receivedAt: string;
  quantity: number;
  unit: string;
  storageClass: StorageClass;
  /** ISO instant or null */
  effectiveExpiry: string | null;
  hazards: { signalWord?: 'Danger' | 'Warning'; pictograms: string[] };
}

const n = (x: number) => `${Number(x.toFixed(3))}mm`;

const HTML_ESCAPES: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' };

export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => HTML_ESCAPES[c]);
}

const STORAGE_WORDS: Record<StorageClass, string> = {
  ambient: 'Store at room temperature',
  refrigerated: 'Keep refrigerated',
  frozen: 'Keep frozen',
};

/**
 * "Use by" text. An expiry at the start of a day in the plant zone means the day before is the
 * last usable day (shared/expiry.ts counts a supplier date as usable through that day), so it
 * prints as that date; any other instant prints with its time.
 */
export function useByText(expiry: string | null, zone: string): string {
  if (!expiry) return 'No expiry date';
  const at = DateTime.fromISO(expiry, { zone });
  if (at.hour === 0 && at.minute === 0 && at.second === 0 && at.millisecond === 0) {
    return `Use by ${formatDate(at.minus({ days: 1 }).toJSDate(), zone)}`;
  }
  return `Use before ${formatDateTime(expiry, zone)}`;
}

function fieldText(field: LabelField, d: LabelData, zone: string): string {
  switch (field) {
    case 'materialName':
      return d.materialName;
    case 'materialCode':
      return d.materialCode;
    case 'supplierLot':
      return `Lot ${d.supplierLot}`;
    case 'containerOfTotal':
      return `Container ${d.seq} of ${d.total}`;
    case 'receivedOn':
      return `Received ${formatDate(d.receivedAt, zone)}`;
    case 'effectiveExpiry':
      return useByText(d.effectiveExpiry, zone);
    case 'storageClass':
      return STORAGE_WORDS[d.storageClass];
    case 'quantity':
      return `${d.quantity} ${d.unit}`;
    case 'supplierName':
      return d.supplierName;
  }
}

/** 1 pt = 1/72 in = 25.4/72 mm (the desktop-publishing point). */
export const PT_MM = 25.4 / 72;
const GAP_MM = 0.5;

/** Width of the text column beside the QR code. */
export function textColumnMm(layout: LabelLayout): number {
  return layout.label.widthMm - 2 * layout.paddingMm - layout.qr.sizeMm - 1.2;
}

/**
 * Pictogram size for `count` pictograms: the layout's size, smaller when they would not fit in
 * one row beside the signal word (a bold upper-case word is at most about 0.75 em per letter),
 * but never under 60 % of it (then the row wraps). Every pictogram is always printed.
 */
export function pictogramSizeMm(layout: LabelLayout, count: number, signalWord?: string): number {
  if (count === 0) return 0;
  const signalMm = signalWord ? signalWord.length * 0.75 * layout.fontPt.body * PT_MM + 1 : 0;
  const fit = (textColumnMm(layout) - signalMm - GAP_MM * (count - 1)) / count;
  return Math.max(Math.min(layout.pictogram.sizeMm, fit), layout.pictogram.sizeMm * 0.6);
}

function hazardBlock(layout: LabelLayout, d: LabelData): string {
  const codes = d.hazards.pictograms.filter((p): p is GhsPictogram => (GHS_PICTOGRAMS as readonly string[]).includes(p));
  if (codes.length === 0 && !d.hazards.signalWord) return '';
  const size = n(pictogramSizeMm(layout, codes.length, d.hazards.signalWord));
  return (
    `<div class="hazards">${codes.map((c) => `<span class="ghs" title="${c}" style="width: ${size}; height: ${size}">${ghsSvg(c)}</span>`).join('')}` +
    (d.hazards.signalWord ? `<span class="signal">${escapeHtml(d.hazards.signalWord)}</span>` : '') +
    '</div>'
  );
}

async function labelHtml(layout: LabelLayout, d: LabelData, zone: string): Promise<string> {
  const lines = layout.lines.map((fields, i) => {
    const text = fields.map((f) => fieldText(f, d, zone)).join(' · ');
    return `<div class="${i === 0 ? 'line title' : 'line'}">${escapeHtml(text)}</div>`;
  });
  return (
    `<div class="label"><div class="qr">${await qrSvg(d.code)}<div class="code">${escapeHtml(d.code)}</div></div>` +
    `<div class="text">${lines.join('')}${hazardBlock(layout, d)}</div></div>`
  );
}

export function layoutCss(layout: LabelLayout): string {
  const { page, label, grid, marginsMm: m, gapMm: g, fontPt: f } = layout;
  return `@page { size: ${n(page.widthMm)} ${n(page.heightMm)}; margin: 0; }
* { box-sizing: border-box; }
html, body { margin: 0; padding: 0; }
body { font-family: 'Noto Sans', 'DejaVu Sans', Arial, sans-serif; color: #000; print-color-adjust: exact; -webkit-print-color-adjust: exact; }
.page { width: ${n(page.widthMm)}; height: ${n(page.heightMm)}; padding: ${n(m.top)} ${n(m.right)} ${n(m.bottom)} ${n(m.left)}; display: grid;
  grid-template-columns: repeat(${grid.cols}, ${n(label.widthMm)}); grid-template-rows: repeat(${grid.rows}, ${n(label.heightMm)});
  column-gap: ${n(g.col)}; row-gap: ${n(g.row)}; overflow: hidden; break-after: page; page-break-after: always; }
.page:last-of-type { break-after: auto; page-break-after: auto; }
.label { width: ${n(label.widthMm)}; height: ${n(label.heightMm)}; padding: ${n(layout.paddingMm)}; overflow: hidden; display: flex; gap: 1.2mm; border-radius: ${n(label.cornerRadiusMm)}; }
.qr { width: ${n(layout.qr.sizeMm)}; flex: none; }
.qr svg { width: ${n(layout.qr.sizeMm)}; height: ${n(layout.qr.sizeMm)}; display: block; }
.code { font-family: 'DejaVu Sans Mono', 'Noto Sans Mono', monospace; font-size: ${f.small}pt; text-align: center; white-space: nowrap; }
.text { flex: 1; min-width: 0; font-size: ${f.body}pt; line-height: 1.15; }
.line { white-space: nowrap; overflow: hidden; text-overflow: ellipsis; }
.title { font-size: ${f.title}pt; font-weight: 700; white-space: normal; display: -webkit-box; -webkit-line-clamp: 2; -webkit-box-orient: vertical; }
.hazards { display: flex; flex-wrap: wrap; align-items: center; gap: ${n(GAP_MM)}; margin-top: 0.5mm; }
.ghs { flex: none; }
.ghs svg { width: 100%; height: 100%; display: block; }
.signal { font-weight: 700; text-transform: uppercase; margin-left: 0.8mm; }
.screen-note { font: 10pt/1.4 'Noto Sans', Arial, sans-serif; max-width: 180mm; margin: 6mm auto; }
@media screen { body { background: #e7e9ec; } .page { background: #fff; margin: 6mm auto; box-shadow: 0 0.5mm 2mm rgba(0,0,0,.25); } .label { outline: 0.2mm dashed #b8bcc4; } }
@media print { .screen-note { display: none; } }`;
}

export interface RenderOptions {
  /** Plant time zone for printed dates. */
  zone: string;
  /** Positions to leave empty at the start of the first sheet. */
  skip?: number;
  title?: string;
}

/** The whole printable document: sheets (or single thermal labels), one page each. */
export async function renderLabelsHtml(layout: LabelLayout, labels: LabelData[], options: RenderOptions): Promise<string> {
  const perPage = layout.grid.cols * layout.grid.rows;
  const skip = Math.min(options.skip ?? 0, perPage - 1);
  const cells: string[] = [...Array.from({ length: skip }, () => '<div class="label empty"></div>')];
  for (const d of labels) cells.push(await labelHtml(layout, d, options.zone));
  const pages: string[] = [];
  for (let i = 0; i < cells.length; i += perPage) pages.push(`<section class="page">${cells.slice(i, i + perPage).join('')}</section>`);
  const hazardous = labels.some((d) => d.hazards.pictograms.length > 0 || d.hazards.signalWord);
  const title = escapeHtml(options.title ?? `Container labels – ${layout.name}`);
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><title>${title}</title>
<style>${layoutCss(layout)}</style></head>
<body>
<div class="screen-note"><strong>${escapeHtml(layout.name)}</strong> – ${labels.length} label(s) on ${pages.length} page(s).
Print at 100 % scale ("actual size"), with no page margins and no headers or footers, on ${escapeHtml(`${layout.page.widthMm} × ${layout.page.heightMm} mm`)} stock.
${hazardous ? "The hazard pictograms and signal word come from the material catalogue; the safety data sheet, local regulations and the plant's own safety rules govern how the material is handled." : ''}</div>
${pages.join('\n')}
</body></html>`;
}

/** What a station code label shows: the code as QR and text, the station's name, kind and area. */
export interface StationLabelData {
  code: string;
  name: string;
  kind: string;
  area: string;
}

async function stationLabelHtml(d: StationLabelData): Promise<string> {
  return (
    `<div class="label"><div class="qr">${await qrSvg(d.code)}<div class="code">${escapeHtml(d.code)}</div></div>` +
    `<div class="text"><div class="line title">${escapeHtml(d.name)}</div><div class="line">Station ${escapeHtml(d.code)}</div>` +
    `<div class="line">${escapeHtml(d.kind)} · ${escapeHtml(d.area)}</div></div></div>`
  );
}

/**
 * Station code labels in a container label layout (same page geometry and QR size): scanning the
 * QR gives the station's code, which the scan lookup and station mode recognise.
 */
export async function renderStationLabelsHtml(layout: LabelLayout, labels: StationLabelData[], options: RenderOptions): Promise<string> {
  const perPage = layout.grid.cols * layout.grid.rows;
  const skip = Math.min(options.skip ?? 0, perPage - 1);
  const cells: string[] = [...Array.from({ length: skip }, () => '<div class="label empty"></div>')];
  for (const d of labels) cells.push(await stationLabelHtml(d));
  const pages: string[] = [];
  for (let i = 0; i < cells.length; i += perPage) pages.push(`<section class="page">${cells.slice(i, i + perPage).join('')}</section>`);
  const title = escapeHtml(options.title ?? `Station code labels – ${layout.name}`);
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><title>${title}</title>
<style>${layoutCss(layout)}</style></head>
<body>
<div class="screen-note"><strong>${escapeHtml(layout.name)}</strong> – ${labels.length} station label(s) on ${pages.length} page(s).
Print at 100 % scale ("actual size"), with no page margins and no headers or footers, on ${escapeHtml(`${layout.page.widthMm} × ${layout.page.heightMm} mm`)} stock.</div>
${pages.join('\n')}
</body></html>`;
}
