import { fileTypeFromBuffer } from 'file-type';
import type { Readable } from 'node:stream';
import type { AuditService } from '../audit/audit.service.ts';
import type { Database } from '../db.ts';
import { AppError, notFound } from '../lib/app-error.ts';
import { sha256Hex } from '../lib/hash.ts';
import { Site } from '../sites/site.model.ts';
import { User, toPersonRef } from '../users/user.model.ts';
import { Attachment } from './attachment.model.ts';
import type { BlobStorage } from './storage.ts';

/** What may be uploaded, judged by the file's first bytes; the extension each type is saved with. */
export const ALLOWED_TYPES: Record<string, string> = { 'image/jpeg': 'jpg', 'image/png': 'png', 'application/pdf': 'pdf' };
export const MAX_ATTACHMENT_BYTES = 10 * 1024 * 1024;
const MAX_FILENAME_CHARS = 150;
const MAX_CAPTION_CHARS = 500;

/**
 * A name safe to hand back in Content-Disposition: no folders, no control or bidirectional
 * override characters, and the extension of the type the bytes really are.
 */
export function sanitiseFilename(name: string, ext: string): string {
  let base = name.split(/[/\\]/).pop() ?? '';
  base = base
    // eslint-disable-next-line no-control-regex
    .replace(/[\u0000-\u001f\u007f-\u009f\u200e\u200f\u202a-\u202e\u2066-\u2069]/g, '')
    .replace(/^[.\s]+/, '')
    .trim()
    .slice(0, MAX_FILENAME_CHARS);
  if (!base) base = 'attachment';
  const known = ext === 'jpg' ? /\.(jpe?g)$/i : new RegExp(`\\.${ext}$`, 'i');
  return known.test(base) ? base : `${base}.${ext}`;
}

export const toAttachment = (a: Attachment) => ({
  id: a.id,
  siteId: a.siteId,
  filename: a.filename,
  caption: a.caption,
  mediaType: a.mediaType,
  size: a.size,
  sha256: a.sha256,
  uploadedBy: toPersonRef(a.uploadedBy),
  createdAt: a.createdAt.toISOString(),
  url: `/api/attachments/${a.id}/content`,
});

export function createAttachmentsService({ db, audit, storage, now }: { db: Database; audit: AuditService; storage: BlobStorage; now: () => Date }) {
  async function assertSite(siteId: string) {
    if (!(await Site.findByPk(siteId, { attributes: ['id'] }))) throw notFound('the site');
  }

  async function list(siteId: string) {
    await assertSite(siteId);
    const rows = await Attachment.findAll({ where: { siteId }, include: [{ model: User, as: 'uploadedBy' }], order: [['id', 'DESC']] });
    return rows.map(toAttachment);
  }

  async function upload(siteId: string, file: { buffer: Buffer; originalname: string }, captionInput: string | undefined, user: User) {
    const caption = captionInput?.trim() || null;
    if (caption && caption.length > MAX_CAPTION_CHARS) throw new AppError(400, 'invalid-caption', `the caption may be at most ${MAX_CAPTION_CHARS} characters long`);
    await assertSite(siteId);
    const found = await fileTypeFromBuffer(file.buffer);
    const ext = found ? ALLOWED_TYPES[found.mime] : undefined;
    if (!found || !ext) {
      throw new AppError(415, 'unsupported-file-type', `only JPEG, PNG and PDF files can be attached; this file's content is ${found ? found.mime : 'of no recognised type'}, whatever its name says`);
    }
    const sha256 = sha256Hex(file.buffer);
    // The bytes first: a row never points at a file that is not there.
    await storage.put(sha256, file.buffer);
    const id = await db.write(async (t) => {
      const a = await Attachment.create(
        { siteId, sha256, size: file.buffer.length, mediaType: found.mime, filename: sanitiseFilename(file.originalname, ext), caption, uploadedById: user.id, createdAt: now() },
        { transaction: t },
      );
      await audit.append(t, { action: 'attachment.uploaded', actor: { id: user.id, email: user.email }, siteId, details: { attachmentId: a.id, filename: a.filename, mediaType: a.mediaType, size: a.size, sha256, caption } });
      return a.id;
    });
    const created = await Attachment.findByPk(id, { include: [{ model: User, as: 'uploadedBy' }] });
    return toAttachment(created!);
  }

  async function content(id: number): Promise<{ attachment: Attachment; stream: Readable }> {
    const attachment = await Attachment.findByPk(id);
    if (!attachment) throw notFound('the attachment');
    try {
      return { attachment, stream: await storage.get(attachment.sha256) };
    } catch {
      throw new AppError(410, 'content-missing', 'the stored file of this attachment is missing');
    }
  }

  return { list, upload, content, assertSite };
}

export type AttachmentsService = ReturnType<typeof createAttachmentsService>;
