import { Router, type RequestHandler } from 'express';
import multer from 'multer';
import { pipeline } from 'node:stream/promises';
import { AppError } from '../lib/app-error.ts';
import type { MountRoute } from '../lib/route.ts';
import { idParam, siteParam } from '../lib/validate.ts';
import { currentUser } from '../middleware/authorize.ts';
import { MAX_ATTACHMENT_BYTES, type AttachmentsService } from './attachments.service.ts';

const upload = multer({
  storage: multer.memoryStorage(),
  limits: { fileSize: MAX_ATTACHMENT_BYTES, files: 1, fields: 5, fieldSize: 4096, parts: 8 },
  defParamCharset: 'utf8',
}).single('file');

/** multer, with every failure of a malformed body turned into a 4xx. */
const readUpload: RequestHandler = (req, res, next) => {
  if (!req.is('multipart/form-data')) throw new AppError(415, 'unsupported-media-type', 'send the file as multipart/form-data with a "file" field');
  upload(req, res, (err?: unknown) => {
    if (!err || err instanceof multer.MulterError) return next(err);
    next(new AppError(400, 'invalid-upload', `the upload could not be read: ${(err as Error).message ?? 'malformed multipart body'}`));
  });
};

/** Content-Disposition with a plain ASCII fallback and the exact name in RFC 5987 form. */
function contentDisposition(filename: string): string {
  const ascii = filename.replace(/[^\x20-\x7e]/g, '_').replace(/["\\]/g, '_');
  return `attachment; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(filename)}`;
}

export function attachmentsRouter(mount: MountRoute, attachments: AttachmentsService) {
  const router = Router();

  mount(router, 'attachments.list', async (req, res) => {
    res.json({ items: await attachments.list(siteParam(req.params.id)) });
  });

  // The site is looked up before the upload is read, so an unknown one costs no 10 MB.
  const siteExists: RequestHandler = async (req, _res, next) => {
    await attachments.assertSite(siteParam(req.params.id));
    next();
  };

  mount(router, 'attachments.upload', siteExists, readUpload, async (req, res) => {
    if (!req.file) throw new AppError(400, 'file-required', 'the upload needs a "file" field');
    const caption = typeof req.body?.caption === 'string' ? req.body.caption : undefined;
    const attachment = await attachments.upload(siteParam(req.params.id), req.file, caption, currentUser(req));
    res.status(201).json({ attachment });
  });

  mount(router, 'attachments.content', async (req, res) => {
    const { attachment, stream } = await attachments.content(idParam(req.params.id, 'the attachment'));
    res.set({
      'Content-Type': attachment.mediaType,
      'Content-Length': String(attachment.size),
      'Content-Disposition': contentDisposition(attachment.filename),
      'X-Content-Type-Options': 'nosniff',
      'Content-Security-Policy': "default-src 'none'; sandbox",
      'Cache-Control': 'private, max-age=3600',
    });
    await pipeline(stream, res);
  });

  return router;
}
