import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { eq, sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';

// A private upload folder and a small size limit for this file, set before the app reads its config.
const uploadDir = await vi.hoisted(async () => {
  const os = await import('node:os');
  const nodeFs = await import('node:fs');
  const nodePath = await import('node:path');
  const dir = nodeFs.mkdtempSync(nodePath.join(os.tmpdir(), 'tacklog-uploads-'));
  process.env.TACKLOG_UPLOAD_DIR = dir;
  process.env.TACKLOG_MAX_UPLOAD_BYTES = String(64 * 1024);
  return dir;
});

import { config } from '../../server/config';
import { db } from '../../server/db/client';
import { auditLog, lots } from '../../server/db/schema';
import { withStoredFile } from '../../server/services/attachments';
import { attachmentSchema } from '../../shared/schemas/attachments';
import { certificateResultSchema, lotDetailSchema } from '../../shared/schemas/lots';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import { fields, jpegBytes, newMaterial, newSupplier, pdfBytes, pngBytes, receive, upload } from '../helpers/receiving';
import { sdsUploadResultSchema } from '../../shared/schemas/materials';

let app: TestApp;
let admin: TestUser;
let clerk: TestUser;
let quality: TestUser;
let assembler: TestUser;
beforeAll(async () => {
  app = await startApp();
  [admin, clerk, quality, assembler] = await Promise.all([
    ensureUser(['admin']),
    ensureUser(['receiving']),
    ensureUser(['quality']),
    ensureUser(['assembler']),
  ]);
});
afterAll(async () => {
  await app.close();
  fs.rmSync(uploadDir, { recursive: true, force: true });
});
const as = (u?: TestUser) => api(app.baseUrl, u?.token);

async function newLot() {
  const supplier = await newSupplier(as(admin));
  const material = await newMaterial(as(admin));
  return (await receive(as(clerk), { materialId: material.id, supplierId: supplier.id, containers: 1 })).lot as { id: string };
}

async function stored() {
  const [{ n }] = (await db.execute(sql`SELECT count(*)::int AS n FROM attachments`)).rows as { n: number }[];
  return { rows: n, files: fs.existsSync(uploadDir) ? fs.readdirSync(uploadDir).sort() : [] };
}

async function download(id: string, token?: string, query = '') {
  const res = await fetch(`${app.baseUrl}/api/attachments/${id}${query}`, { headers: token ? { authorization: `Bearer ${token}` } : {} });
  return { status: res.status, headers: res.headers, bytes: Buffer.from(await res.arrayBuffer()) };
}

describe('certificate of analysis upload', () => {
  it('uses the configured folder and limit', () => {
    expect(config.uploadDir).toBe(uploadDir);
    expect(config.maxUploadBytes).toBe(64 * 1024);
  });

  it('stores a PDF with its SHA-256; download needs a session and sends type and file name', async () => {
    const lot = await newLot();
    const bytes = pdfBytes('Lot B-2291, viscosity 2400 mPa·s');
    const res = await upload(app.baseUrl, `/api/lots/${lot.id}/certificate`, {
      bytes,
      type: 'application/pdf',
      filename: 'CoA B-2291.pdf',
      fields: { expiresOn: '2027-01-31' },
      token: clerk.token,
    });
    expect(res.status).toBe(201);
    const { attachment, lot: updated } = certificateResultSchema.parse(res.body);
    expect(attachment).toMatchObject({
      kind: 'certificate',
      filename: 'CoA B-2291.pdf',
      mimeType: 'application/pdf',
      sizeBytes: bytes.length,
      uploadedBy: clerk.id,
    });
    // The digest is computed here independently with node:crypto (FIPS 180-4 SHA-256).
    expect(attachment.sha256).toBe(crypto.createHash('sha256').update(bytes).digest('hex'));
    expect(updated).toMatchObject({ certificateId: attachment.id, certificateExpiresOn: '2027-01-31' });
    expect(fs.readdirSync(uploadDir).some((f) => fs.readFileSync(path.join(uploadDir, f)).equals(bytes))).toBe(true);

    expect((await download(attachment.id)).status).toBe(401);
    const got = await download(attachment.id, assembler.token);
    expect(got.status).toBe(200);
    expect(got.headers.get('content-type')).toBe('application/pdf');
    expect(got.headers.get('content-disposition')).toBe(`attachment; filename="CoA B-2291.pdf"; filename*=UTF-8''CoA%20B-2291.pdf`);
    expect(got.bytes.equals(bytes)).toBe(true);
    expect((await download(attachment.id, assembler.token, '?disposition=inline')).headers.get('content-disposition')).toMatch(/^inline; /);
    expect(attachmentSchema.parse((await as(assembler).get(`/api/attachments/${attachment.id}/meta`)).body).id).toBe(attachment.id);

    const detail = lotDetailSchema.parse((await as(assembler).get(`/api/lots/${lot.id}`)).body);
    expect(detail.certificate?.id).toBe(attachment.id);
    const [audit] = await db
      .select()
      .from(auditLog)
      .where(eq(auditLog.entityId, lot.id))
      .orderBy(sql`${auditLog.id} DESC`)
      .limit(1);
    expect(audit).toMatchObject({
      action: 'lot.certificate',
      before: { certificateId: null },
      after: { certificateId: attachment.id, sha256: attachment.sha256 },
    });
  });

  it('accepts PNG and JPEG scans (quality too) and keeps a non-ASCII file name', async () => {
    const lot = await newLot();
    const png = await upload(app.baseUrl, `/api/lots/${lot.id}/certificate`, {
      bytes: pngBytes(),
      type: 'image/png',
      filename: 'Prüfbericht.png',
      token: quality.token,
    });
    expect(png.status).toBe(201);
    expect(png.body.attachment.filename).toBe('Prüfbericht.png');
    const got = await download(png.body.attachment.id, clerk.token);
    expect(got.headers.get('content-type')).toBe('image/png');
    expect(got.headers.get('content-disposition')).toBe(`attachment; filename="Pr_fbericht.png"; filename*=UTF-8''Pr%C3%BCfbericht.png`);
    const jpg = await upload(app.baseUrl, `/api/lots/${lot.id}/certificate`, {
      bytes: jpegBytes(),
      type: 'image/jpeg',
      filename: 'scan.jpg',
      token: clerk.token,
    });
    expect(jpg.status).toBe(201);
    const [row] = await db.select().from(lots).where(eq(lots.id, lot.id));
    expect(row.certificateId).toBe(jpg.body.attachment.id);
  });

  it('refuses too large (413), wrong type, mismatched content, empty or missing files (400 file), wrong role, and stores nothing', async () => {
    const lot = await newLot();
    const target = `/api/lots/${lot.id}/certificate`;
    const before = await stored();
    const big = Buffer.concat([pdfBytes(), Buffer.alloc(64 * 1024, 0x20)]);
    const tooLarge = await upload(app.baseUrl, target, { bytes: big, type: 'application/pdf', token: clerk.token });
    expect(tooLarge.status).toBe(413);
    expect(fields(tooLarge.body)).toEqual(['file']);
    const cases: [Parameters<typeof upload>[2], number, string[]][] = [
      [{ bytes: Buffer.from('just text'), type: 'text/plain', filename: 'notes.txt' }, 400, ['file']],
      [{ bytes: pngBytes(), type: 'application/pdf' }, 400, ['file']],
      [{ bytes: pdfBytes(), type: 'image/png', filename: 'x.png' }, 400, ['file']],
      [{ bytes: Buffer.from('<html><script>alert(1)</script>'), type: 'text/html', filename: 'x.html' }, 400, ['file']],
      [{ bytes: Buffer.alloc(0), type: 'application/pdf' }, 400, ['file']],
      [{ bytes: pdfBytes(), type: 'application/pdf', field: 'document' }, 400, ['file']],
      [{ bytes: pdfBytes(), type: 'application/pdf', fields: { expiresOn: '31.01.2027' } }, 400, ['expiresOn']],
    ];
    for (const [options, status, named] of cases) {
      const res = await upload(app.baseUrl, target, { ...options, token: clerk.token });
      expect(res.status, JSON.stringify({ ...options, bytes: options.bytes.length })).toBe(status);
      expect([...new Set(fields(res.body))]).toEqual(named);
    }
    const missing = await fetch(`${app.baseUrl}${target}`, {
      method: 'POST',
      body: (() => {
        const f = new FormData();
        f.append('expiresOn', '2027-01-01');
        return f;
      })(),
      headers: { authorization: `Bearer ${clerk.token}` },
    });
    expect(missing.status).toBe(400);
    expect(fields(await missing.json())).toEqual(['file']);
    expect((await upload(app.baseUrl, target, { bytes: pdfBytes(), type: 'application/pdf' })).status).toBe(401);
    expect((await upload(app.baseUrl, target, { bytes: pdfBytes(), type: 'application/pdf', token: assembler.token })).status).toBe(403);
    expect(
      (
        await upload(app.baseUrl, `/api/lots/${crypto.randomUUID()}/certificate`, {
          bytes: pdfBytes(),
          type: 'application/pdf',
          token: clerk.token,
        })
      ).status,
    ).toBe(404);
    expect(
      fields(
        (await upload(app.baseUrl, '/api/lots/nope/certificate', { bytes: pdfBytes(), type: 'application/pdf', token: clerk.token })).body,
      ),
    ).toEqual(['params.id']);
    expect(await stored()).toEqual(before);
    const [row] = await db.select().from(lots).where(eq(lots.id, lot.id));
    expect(row.certificateId).toBeNull();
  });
});

describe('storage clean-up', () => {
  it('removes the written file again when recording it fails', async () => {
    const before = await stored();
    const bytes = pdfBytes();
    let written = '';
    const failing = withStoredFile(
      { originalname: 'x.pdf', mimetype: 'application/pdf', size: bytes.length, buffer: bytes },
      'application/pdf',
      async ({ storagePath }) => {
        written = storagePath;
        expect(fs.existsSync(path.join(uploadDir, storagePath))).toBe(true);
        throw new Error('the database refused the row');
      },
    );
    await expect(failing).rejects.toThrow('the database refused the row');
    expect(written).not.toBe('');
    expect(await stored()).toEqual(before);
  });
});

describe('safety data sheet upload and downloads', () => {
  it('stores an SDS for a material (admin only)', async () => {
    const material = await newMaterial(as(admin), { hazards: { signalWord: 'Warning', pictograms: ['GHS07'], statements: ['H317'] } });
    const before = await stored();
    expect(
      (
        await upload(app.baseUrl, `/api/materials/${material.id}/sds`, {
          bytes: pdfBytes('SDS'),
          type: 'application/pdf',
          token: clerk.token,
        })
      ).status,
    ).toBe(403);
    expect(await stored()).toEqual(before);
    const res = await upload(app.baseUrl, `/api/materials/${material.id}/sds`, {
      bytes: pdfBytes('SDS'),
      type: 'application/pdf',
      filename: 'sds.pdf',
      token: admin.token,
    });
    expect(res.status).toBe(201);
    expect(sdsUploadResultSchema.safeParse(res.body).success).toBe(true);
    expect(res.body.material.sdsAttachmentId).toBe(res.body.attachment.id);
    expect(res.body.attachment.kind).toBe('sds');
    expect((await as(assembler).get(`/api/materials/${material.id}`)).body.sdsAttachmentId).toBe(res.body.attachment.id);
  });

  it('400 for a bad id, 404 for an unknown one', async () => {
    expect(fields((await as(assembler).get('/api/attachments/abc')).body)).toEqual(['params.id']);
    expect((await download(crypto.randomUUID(), assembler.token)).status).toBe(404);
    expect(fields((await as(assembler).get(`/api/attachments/${crypto.randomUUID()}?disposition=open`)).body)).toEqual([
      'query.disposition',
    ]);
  });
});
