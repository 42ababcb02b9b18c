// Uploads: the type is judged by the bytes, never by the name or the declared type; sizes are
// capped; names are made safe; stored files are inert blobs named by their hash, and a download
// is always an attachment that no browser renders as a page.
import { createHash } from 'node:crypto';
import { readdir, stat, writeFile, mkdir } from 'node:fs/promises';
import path from 'node:path';
import fc from 'fast-check';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app.ts';
import type { Role } from '../../server/auth/permissions.ts';
import { accountsByRole, push, siteText, startWeir, state, type Account, type TestWeir } from './support/in-process.ts';

const SITE = 'mill-lane-bakery';
/** A 1×1 PNG: signature, IHDR, IDAT, IEND. */
const PNG = Buffer.from('89504e470d0a1a0a0000000d49484452000000010000000108060000001f15c4890000000d49444154789c63000100000500010d0a2db40000000049454e44ae426082', 'hex');
/** The start of a JPEG (SOI, APP0 "JFIF") and a one-page PDF's header and trailer. */
const JPEG = Buffer.concat([Buffer.from('ffd8ffe000104a46494600010100000100010000', 'hex'), Buffer.alloc(64), Buffer.from('ffd9', 'hex')]);
const PDF = Buffer.from('%PDF-1.4\n1 0 obj<</Type/Catalog>>endobj\ntrailer<</Root 1 0 R>>\n%%EOF\n');
const HTML = Buffer.from('<!doctype html><html><body><script>document.title = "ran"</script></body></html>');
const ALLOWED = ['image/png', 'image/jpeg', 'application/pdf'];
let n = 0;
/** The same file made distinct (bytes after the end marker), so each upload stores a new blob. */
const distinct = (b: Buffer) => Buffer.concat([b, Buffer.from(`\n#${n++}`)]);

let weir: TestWeir;
let accounts: Record<Role, Account>;
const api = () => request(weir.app);
const upload = (file: Buffer, filename: string, contentType: string, caption?: string) => {
  const req = api().post(`/api/sites/${SITE}/attachments`).set(accounts.installer.auth);
  if (caption !== undefined) req.field('caption', caption);
  return req.attach('file', file, { filename, contentType });
};
const download = (id: number) => api().get(`/api/attachments/${id}/content`).set(accounts.auditor.auth).buffer(true).parse((res, done) => {
  const chunks: Buffer[] = [];
  res.on('data', (c: Buffer) => chunks.push(c));
  res.on('end', () => done(null, Buffer.concat(chunks)));
});

/** Every download: an attachment, never sniffed, never HTML, sandboxed even if opened. */
function expectInertDownload(res: request.Response) {
  expect(res.status).toBe(200);
  expect(ALLOWED).toContain(res.headers['content-type'].split(';')[0]);
  expect(res.headers['content-disposition']).toMatch(/^attachment;/);
  expect(res.headers['x-content-type-options']).toBe('nosniff');
  expect(res.headers['content-security-policy']).toMatch(/sandbox/);
  expect(res.headers['content-security-policy']).toMatch(/default-src 'none'/);
}

beforeAll(async () => {
  weir = await startWeir();
  accounts = await accountsByRole(weir);
  await push(weir, accounts.installer, await siteText()).expect(201);
});
afterAll(() => weir?.close());

describe('the type is the bytes\' type', () => {
  it('When a PNG is declared and named as a PDF, then it is stored and served as image/png with a .png name', async () => {
    const res = await upload(distinct(PNG), 'report.pdf', 'application/pdf').expect(201);
    expect(res.body.attachment.mediaType).toBe('image/png');
    expect(res.body.attachment.filename).toMatch(/\.png$/);
    const got = await download(res.body.attachment.id);
    expectInertDownload(got);
    expect(got.headers['content-type']).toBe('image/png');
  });

  it('When HTML, SVG, script, executable or archive bytes come named as images or PDFs, then 415 and nothing is kept', async () => {
    const before = await state(weir);
    const liars: [string, Buffer, string, string][] = [
      ['HTML as PNG', HTML, 'photo.png', 'image/png'],
      ['HTML as PDF', HTML, 'report.pdf', 'application/pdf'],
      ['SVG with a script', Buffer.from('<svg xmlns="http://www.w3.org/2000/svg" onload="alert(1)"><script>alert(2)</script></svg>'), 'diagram.png', 'image/svg+xml'],
      ['XHTML', Buffer.from('<?xml version="1.0"?><html xmlns="http://www.w3.org/1999/xhtml"><script>alert(1)</script></html>'), 'a.jpg', 'image/jpeg'],
      ['a shell script', Buffer.from('#!/bin/sh\nrm -rf /\n'), 'photo.jpg', 'image/jpeg'],
      ['a Windows executable', Buffer.concat([Buffer.from('MZ\x90\x00', 'latin1'), Buffer.alloc(300)]), 'report.pdf', 'application/pdf'],
      ['an ELF executable', Buffer.concat([Buffer.from('7f454c46020101', 'hex'), Buffer.alloc(300)]), 'meter.png', 'image/png'],
      ['a ZIP archive', Buffer.concat([Buffer.from('504b0304140000000800', 'hex'), Buffer.alloc(300)]), 'photos.pdf', 'application/pdf'],
      ['a GIF (an image, but not an allowed one)', Buffer.from('GIF89a\x01\x00\x01\x00\x00\x00\x00;', 'latin1'), 'photo.png', 'image/png'],
      ['an empty file', Buffer.alloc(0), 'empty.png', 'image/png'],
    ];
    for (const [what, bytes, name, type] of liars) {
      const res = await upload(bytes, name, type);
      // An empty file part may be read as no file at all (400 file-required).
      expect([400, 415], what).toContain(res.status);
      expect(res.body.error.message.length, what).toBeGreaterThan(10);
    }
    expect(await state(weir)).toEqual(before);
  });

  it('When a real PNG or JPEG carries HTML after its header (a polyglot), then it is only ever served as that image, as an attachment', async () => {
    for (const [head, type] of [[PNG, 'image/png'], [JPEG, 'image/jpeg']] as const) {
      const res = await upload(Buffer.concat([head, HTML]), 'page.html', 'text/html').expect(201);
      expect(res.body.attachment.mediaType).toBe(type);
      expect(res.body.attachment.filename).not.toMatch(/\.html?$/);
      const got = await download(res.body.attachment.id);
      expectInertDownload(got);
      expect(got.headers['content-type']).toBe(type);
    }
  });
});

describe('sizes', () => {
  it('When the file is exactly 10 MiB, then it is taken; one byte more, then 413 file-too-large and nothing is kept', async () => {
    // 10 MiB = 10 × 1024 × 1024 bytes: MAX_ATTACHMENT_BYTES in server/attachments/attachments.service.ts.
    const limit = 10 * 1024 * 1024;
    const exact = Buffer.concat([PNG, Buffer.alloc(limit - PNG.length, 7)]);
    const ok = await upload(exact, 'big.png', 'image/png').expect(201);
    expect(ok.body.attachment.size).toBe(limit);
    const before = await state(weir);
    const over = Buffer.concat([PNG, Buffer.alloc(limit - PNG.length + 1, 8)]);
    const res = await upload(over, 'bigger.png', 'image/png').expect(413);
    expect(res.body.error.code).toBe('file-too-large');
    expect(await state(weir)).toEqual(before);
  });
});

describe('names', () => {
  // Control characters, bidirectional overrides, path separators, quotes and leading dots, mixed
  // with ordinary text; NUL is left out (it ends the part header: a 400, tested in hostile-input).
  const piece = fc.oneof(
    fc.constantFrom('../', '..\\', '/', '\\', '/etc/passwd', 'C:\\x\\', '"', "'", ';', '\r\n', '\t', '\u0007', '\u001b[31m', '\u007f', '\u0085', '\u202e', '\u2066', '\u200f', '.', ' ', '.htaccess', 'index.html', '%2e%2e%2f', 'é', '\u{1F600}', '<b>'),
    fc.string({ minLength: 1, maxLength: 8 }).filter((s) => !s.includes('\u0000')),
  );
  const hostileName = fc.array(piece, { minLength: 1, maxLength: 8 }).map((parts) => parts.join(''));

  it('When the name holds paths, control or bidi characters, quotes or markup, then the stored name and Content-Disposition are safe', async () => {
    await fc.assert(fc.asyncProperty(hostileName, async (name) => {
      const res = await upload(distinct(PNG), name, 'image/png');
      if (res.status === 400) {
        // busboy refuses some raw header bytes outright, and reads a name that is only a path
        // ("../") as no file at all: refused with a message is fine.
        expect(res.body.error.code).toMatch(/^(invalid-upload|file-required)$/);
        return;
      }
      expect(res.status, res.text).toBe(201);
      const stored: string = res.body.attachment.filename;
      expect(stored).not.toMatch(/[/\\]/);
      // eslint-disable-next-line no-control-regex
      expect(stored).not.toMatch(/[\u0000-\u001f\u007f-\u009f\u200e\u200f\u202a-\u202e\u2066-\u2069]/);
      expect(stored).not.toMatch(/^[.\s]/);
      expect(stored).toMatch(/\.png$/);
      expect(stored.length).toBeLessThanOrEqual(160);
      const got = await download(res.body.attachment.id);
      expectInertDownload(got);
      const disposition: string = got.headers['content-disposition'];
      // One header line, the quoted fallback without quotes or backslashes inside.
      expect(disposition).toMatch(/^attachment; filename="[\x20-\x21\x23-\x5b\x5d-\x7e]*"; filename\*=UTF-8''[\x21-\x7e]+$/);
      const encoded = /filename\*=UTF-8''(.+)$/.exec(disposition)![1];
      expect(decodeURIComponent(encoded)).toBe(stored);
    }), { numRuns: 40 });
  });

  it('When a caption carries markup, then it is kept as text, byte for byte', async () => {
    const caption = '<img src=x onerror=alert(1)> meter & CT "L1"';
    const res = await upload(distinct(PNG), 'ct.png', 'image/png', caption).expect(201);
    const list = await api().get(`/api/sites/${SITE}/attachments`).set(accounts.lead.auth).expect(200);
    expect(list.headers['content-type']).toMatch(/^application\/json/);
    expect(list.body.items.find((a: { id: number }) => a.id === res.body.attachment.id).caption).toBe(caption);
  });
});

describe('stored files', () => {
  it('When files are stored, then each is a blob named by its SHA-256, with no extension and no execute bit', async () => {
    const walk = async (dir: string): Promise<string[]> => (await Promise.all((await readdir(dir, { withFileTypes: true })).map((e) => (e.isDirectory() ? walk(path.join(dir, e.name)) : [path.join(dir, e.name)])))).flat();
    const files = await walk(weir.config.uploadsDir);
    expect(files.length).toBeGreaterThan(5);
    for (const file of files) {
      const name = path.basename(file);
      expect(name, file).toMatch(/^[0-9a-f]{64}$/);
      expect(path.basename(path.dirname(file))).toBe(name.slice(0, 2));
      expect((await stat(file)).mode & 0o111, `${file} is executable`).toBe(0);
    }
  });

  it('When a stored file is downloaded, then the bytes are the uploaded ones (its hash is its name)', async () => {
    const bytes = distinct(PDF);
    const res = await upload(bytes, 'export-test.pdf', 'application/pdf').expect(201);
    const got = await download(res.body.attachment.id);
    expectInertDownload(got);
    expect(createHash('sha256').update(got.body as Buffer).digest('hex')).toBe(res.body.attachment.sha256);
  });

  it('When the upload folder is asked for directly, with the reviewer served, then no stored file comes back', async () => {
    // The same app with a (tiny) reviewer folder, as main.ts serves dist/web.
    const webDir = path.join(weir.dataDir, 'web');
    await mkdir(webDir, { recursive: true });
    await writeFile(path.join(webDir, 'index.html'), '<!doctype html><title>Weir</title>');
    const withWeb = createApp({ ...weir.runtime, config: { ...weir.config, webDir } });
    const res = await upload(distinct(PNG), 'x.png', 'image/png').expect(201);
    const { sha256 } = res.body.attachment;
    const rel = `${sha256.slice(0, 2)}/${sha256}`;
    for (const url of [`/uploads/${rel}`, `/${rel}`, `/api/uploads/${rel}`, `/../uploads/${rel}`, `/%2e%2e/uploads/${rel}`, `/assets/..%2f..%2fuploads%2f${rel}`, '/weir.sqlite', '/../weir.sqlite', '/%2e%2e/weir.sqlite', '/jwt-secret', '/%2e%2e/jwt-secret']) {
      const got = await request(withWeb).get(url).buffer(true);
      const body = Buffer.isBuffer(got.body) ? got.body : Buffer.from(got.text ?? '');
      expect(body.includes(PNG.subarray(0, 16)), url).toBe(false);
      expect(body.toString('latin1'), url).not.toMatch(/SQLite format 3|security-tests-secret/);
      expect(got.status, url).toBeLessThan(500);
    }
  });
});
