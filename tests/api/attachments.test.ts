import { createHash } from 'node:crypto';
import { existsSync } from 'node:fs';
import path from 'node:path';
import { crc32, deflateSync } from 'node:zlib';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { account, push, siteText, startWeir, type Account, type TestWeir } from './helpers.ts';

let weir: TestWeir;
let installer: Account;
let lead: Account;
let auditor: Account;
let admin: Account;
const SITE = 'mill-lane-bakery';

beforeAll(async () => {
  weir = await startWeir();
  [installer, lead, auditor, admin] = await Promise.all([account(weir, 'installer'), account(weir, 'lead'), account(weir, 'auditor'), account(weir, 'admin')]);
  await push(weir, installer, await siteText()).expect(201);
});
afterAll(() => weir.close());

const api = () => request(weir.app);

/** A real 1×1 grey PNG: signature, IHDR, IDAT, IEND (PNG spec, ISO/IEC 15948). */
function png(): Buffer {
  const chunk = (type: string, data: Buffer) => {
    const body = Buffer.concat([Buffer.from(type, 'ascii'), data]);
    const len = Buffer.alloc(4);
    len.writeUInt32BE(data.length);
    const crc = Buffer.alloc(4);
    crc.writeUInt32BE(crc32(body));
    return Buffer.concat([len, body, crc]);
  };
  const ihdr = Buffer.from([0, 0, 0, 1, 0, 0, 0, 1, 8, 0, 0, 0, 0]); // 1×1, 8-bit greyscale
  return Buffer.concat([Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), chunk('IHDR', ihdr), chunk('IDAT', deflateSync(Buffer.from([0, 0x80]))), chunk('IEND', Buffer.alloc(0))]);
}

/** The start of a JFIF file (SOI + APP0 "JFIF", ITU-T T.81 / JFIF 1.02) and EOI: enough to be recognised by its bytes. */
const jpeg = () =>
  Buffer.concat([Buffer.from([0xff, 0xd8, 0xff, 0xe0, 0x00, 0x10]), Buffer.from('JFIF\0', 'latin1'), Buffer.from([1, 2, 0, 0, 1, 0, 1, 0, 0]), Buffer.from([0xff, 0xd9])]);

/** A minimal one-page PDF (ISO 32000-1 §7.5: header, objects, trailer). */
const pdf = () =>
  Buffer.from(
    '%PDF-1.4\n1 0 obj << /Type /Catalog /Pages 2 0 R >> endobj\n2 0 obj << /Type /Pages /Kids [3 0 R] /Count 1 >> endobj\n3 0 obj << /Type /Page /Parent 2 0 R /MediaBox [0 0 200 200] >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n',
    'latin1',
  );

function upload(who: Account, file: Buffer, filename: string, contentType: string, caption?: string, site = SITE) {
  const req = api().post(`/api/sites/${site}/attachments`).set(who.auth);
  if (caption !== undefined) req.field('caption', caption);
  return req.attach('file', file, { filename, contentType });
}

describe('uploads', () => {
  it.each([
    ['a PNG photo', png, 'meter-cabinet.png', 'image/png', 'image/png'],
    ['a JPEG photo', jpeg, 'ct-on-l1.JPG', 'image/jpeg', 'image/jpeg'],
    ['a PDF test report', pdf, 'export-test.pdf', 'application/pdf', 'application/pdf'],
  ])('When an installer uploads %s, then 201 and it is stored by its content hash', async (_what, make, filename, declared, expected) => {
    const bytes = make();
    const res = await upload(installer, bytes, filename, declared, 'Taken at commissioning').expect(201);
    const sha256 = createHash('sha256').update(bytes).digest('hex');
    expect(res.body.attachment).toMatchObject({ siteId: SITE, filename, caption: 'Taken at commissioning', mediaType: expected, size: bytes.length, sha256, uploadedBy: { id: installer.id } });
    expect(existsSync(path.join(weir.config.uploadsDir, sha256.slice(0, 2), sha256))).toBe(true);
  });

  it('When a file is not what its name and declared type say, then 415 unsupported-file-type and nothing is stored', async () => {
    const before = (await api().get(`/api/sites/${SITE}/attachments`).set(auditor.auth).expect(200)).body.items.length;
    const html = Buffer.from('<!doctype html><script>alert(1)</script>');
    const disguised = await upload(installer, html, 'photo.png', 'image/png').expect(415);
    expect(disguised.body.error.code).toBe('unsupported-file-type');
    // A real image, but not one of the three allowed types: GIF89a signature.
    await upload(installer, Buffer.from('GIF89a\x01\x00\x01\x00\x00\x00\x00;', 'latin1'), 'photo.jpg', 'image/jpeg').expect(415);
    // A Windows executable's MZ header named as a PDF.
    await upload(installer, Buffer.concat([Buffer.from('MZ'), Buffer.alloc(200)]), 'report.pdf', 'application/pdf').expect(415);
    const after = (await api().get(`/api/sites/${SITE}/attachments`).set(auditor.auth).expect(200)).body.items.length;
    expect(after).toBe(before);
  });

  it('When a name hides a path, control characters or the wrong extension, then the stored name is made safe', async () => {
    const res = await upload(lead, png(), '../../etc/\u202Egnp.exe\r\nX-Evil: 1', 'image/png').expect(201);
    expect(res.body.attachment.filename).toBe('gnp.exeX-Evil: 1.png');
  });

  it('When the file is over 10 MB, then 413 file-too-large', async () => {
    const big = Buffer.concat([png(), Buffer.alloc(10 * 1024 * 1024)]);
    const res = await upload(installer, big, 'huge.png', 'image/png').expect(413);
    expect(res.body.error.code).toBe('file-too-large');
  });

  it('When the upload is malformed, then a 4xx: no file, not multipart, a long caption, an unknown site', async () => {
    expect((await api().post(`/api/sites/${SITE}/attachments`).set(installer.auth).field('caption', 'no file').expect(400)).body.error.code).toBe('file-required');
    expect((await api().post(`/api/sites/${SITE}/attachments`).set(installer.auth).send({ file: 'x' }).expect(415)).body.error.code).toBe('unsupported-media-type');
    await upload(installer, png(), 'a.png', 'image/png', 'x'.repeat(501)).expect(400);
    await upload(installer, png(), 'a.png', 'image/png', undefined, 'no-such-site').expect(404);
    await api()
      .post(`/api/sites/${SITE}/attachments`)
      .set(installer.auth)
      .set('Content-Type', 'multipart/form-data; boundary=xyz')
      .send('--xyz\r\nContent-Disposition: form-data; name="file"; filename="a.png"\r\n\r\nunterminated')
      .expect(400);
  });

  it('When an auditor or an admin uploads, then 403; without a token, then 401', async () => {
    for (const who of [auditor, admin]) expect((await upload(who, png(), 'a.png', 'image/png').expect(403)).body.error.code).toBe('forbidden');
    await api().post(`/api/sites/${SITE}/attachments`).attach('file', png(), 'a.png').expect(401);
  });
});

describe('listing and download', () => {
  it('When listed, then every attachment of the site is there, newest first', async () => {
    const res = await api().get(`/api/sites/${SITE}/attachments`).set(auditor.auth).expect(200);
    expect(res.body.items.map((a: { mediaType: string }) => a.mediaType)).toEqual(['image/png', 'application/pdf', 'image/jpeg', 'image/png']);
    await api().get('/api/sites/no-such-site/attachments').set(auditor.auth).expect(404);
  });

  it('When downloaded, then the stored bytes with the verified type, attachment disposition and nosniff', async () => {
    const list = await api().get(`/api/sites/${SITE}/attachments`).set(auditor.auth).expect(200);
    const pdfItem = list.body.items.find((a: { mediaType: string }) => a.mediaType === 'application/pdf');
    const res = await api().get(pdfItem.url).set(auditor.auth).buffer(true).parse((r, cb) => {
      const parts: Buffer[] = [];
      r.on('data', (c: Buffer) => parts.push(c));
      r.on('end', () => cb(null, Buffer.concat(parts)));
    }).expect(200);
    expect(res.headers['content-type']).toBe('application/pdf');
    expect(res.headers['content-disposition']).toBe(`attachment; filename="export-test.pdf"; filename*=UTF-8''export-test.pdf`);
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(Buffer.compare(res.body, pdf())).toBe(0);

    const odd = list.body.items.find((a: { filename: string }) => a.filename.includes('Evil'));
    const safe = await api().get(odd.url).set(installer.auth).expect(200);
    expect(safe.headers['content-disposition']).toBe(`attachment; filename="gnp.exeX-Evil: 1.png"; filename*=UTF-8''gnp.exeX-Evil%3A%201.png`);
  });

  it('When the attachment is unknown, then 404; without a token, then 401', async () => {
    await api().get('/api/attachments/999999/content').set(auditor.auth).expect(404);
    await api().get('/api/attachments/abc/content').set(auditor.auth).expect(404);
    await api().get('/api/attachments/1/content').expect(401);
  });

  it('When an upload happens, then the change log has attachment.uploaded', async () => {
    const res = await api().get('/api/audit').query({ action: 'attachment.uploaded', site: SITE }).set(auditor.auth).expect(200);
    expect(res.body.total).toBe(4);
    expect(res.body.items[0].details).toMatchObject({ mediaType: 'image/png', filename: 'gnp.exeX-Evil: 1.png' });
  });
});
