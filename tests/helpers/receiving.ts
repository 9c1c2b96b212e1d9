/**
 * Helpers for the receiving, catalogue and label API tests: catalogue records made through
 * the API itself, multipart uploads, and tiny valid PDF/PNG/JPEG files. Names are invented.
 */
import crypto from 'node:crypto';
import type { ApiClient } from './api';
import { gtinCheckDigit } from '../../shared/gs1';
import type { MaterialInput } from '../../shared/schemas/materials';
import type { ReceiveLotInput } from '../../shared/schemas/lots';

export const uniq = (): string => crypto.randomBytes(3).toString('hex').toUpperCase();

/**
 * A fresh GTIN-14 for a test material (GTINs are unique in the catalogue). Prefix 02 is not
 * used for trade items at retail; the check digit follows the GS1 rule.
 */
export function randomGtin(): string {
  const body = `02${String(crypto.randomInt(0, 1e11)).padStart(11, '0')}`;
  return body + String(gtinCheckDigit(body));
}

/** A supplier made by an admin through POST /api/suppliers. */
export async function newSupplier(admin: ApiClient, name = 'Quellmoor Bonding Supply') {
  const res = await admin.post('/api/suppliers', { name: `${name} ${uniq()}` });
  if (res.status !== 201) throw new Error(`supplier: ${res.status} ${JSON.stringify(res.body)}`);
  return res.body as { id: string; code: string; name: string };
}

/** A material made by an admin through POST /api/materials (an ambient adhesive by default). */
export async function newMaterial(admin: ApiClient, fields: Partial<MaterialInput> = {}) {
  const s = uniq();
  const res = await admin.post('/api/materials', {
    code: `T-${s}`,
    name: `Test adhesive ${s}`,
    kind: 'adhesive',
    unit: 'g',
    requiresInspection: false,
    ...fields,
  });
  if (res.status !== 201) throw new Error(`material: ${res.status} ${JSON.stringify(res.body)}`);
  // eslint-disable-next-line @typescript-eslint/no-explicit-any
  return res.body as any;
}

/** A lot received through POST /api/lots; returns {lot, containers}. */
export async function receive(clerk: ApiClient, body: Partial<ReceiveLotInput> & { materialId: string; supplierId: string }) {
  const res = await clerk.post('/api/lots', { supplierLot: `SL-${uniq()}`, containers: 2, quantityPerContainer: 250, ...body });
  if (res.status !== 201) throw new Error(`receive: ${res.status} ${JSON.stringify(res.body)}`);
  // eslint-disable-next-line @typescript-eslint/no-explicit-any
  return res.body as { lot: any; containers: any[] };
}

/** The smallest well-formed files of each kind: magic bytes first (ISO 32000, PNG spec, JFIF). */
export function pdfBytes(text = 'Certificate of analysis'): Buffer {
  return Buffer.from(`%PDF-1.4\n% ${text}\n1 0 obj << /Type /Catalog >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n`, 'latin1');
}
export function pngBytes(): Buffer {
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    Buffer.from('0000000d49484452', 'hex'),
    crypto.randomBytes(32),
  ]);
}
export function jpegBytes(): Buffer {
  return Buffer.concat([Buffer.from([0xff, 0xd8, 0xff, 0xe0]), crypto.randomBytes(64), Buffer.from([0xff, 0xd9])]);
}

export interface UploadOptions {
  bytes: Buffer;
  type: string;
  filename?: string;
  field?: string;
  fields?: Record<string, string>;
  token?: string;
}

/** POST multipart/form-data; resolves to {status, body} like api(). */
export async function upload(baseUrl: string, path: string, o: UploadOptions) {
  const form = new FormData();
  for (const [k, v] of Object.entries(o.fields ?? {})) form.append(k, v);
  form.append(o.field ?? 'file', new Blob([new Uint8Array(o.bytes)], { type: o.type }), o.filename ?? 'document.pdf');
  const res = await fetch(`${baseUrl}${path}`, {
    method: 'POST',
    body: form,
    headers: o.token ? { authorization: `Bearer ${o.token}` } : {},
  });
  const text = await res.text();
  // eslint-disable-next-line @typescript-eslint/no-explicit-any
  const body: any = (res.headers.get('content-type') ?? '').includes('json') && text ? JSON.parse(text) : text;
  return { status: res.status, body, headers: res.headers };
}

/** The `field` names of a 400's details. */
export function fields(body: { error?: { details?: { field: string }[] } }): string[] {
  return (body.error?.details ?? []).map((d) => d.field);
}
