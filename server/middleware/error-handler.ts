import type { ErrorRequestHandler, RequestHandler } from 'express';
import multer from 'multer';
import { AppError } from '../lib/app-error.ts';

// body-parser's error types, as clear 4xx answers.
const BODY_ERRORS: Record<string, [number, string, string]> = {
  'entity.parse.failed': [400, 'invalid-json', 'the request body is not valid JSON'],
  'entity.too.large': [413, 'payload-too-large', 'the request body is too large'],
  'encoding.unsupported': [415, 'unsupported-encoding', 'the request body uses a content encoding this server does not read'],
  'charset.unsupported': [415, 'unsupported-charset', 'the request body must be UTF-8'],
  'request.aborted': [400, 'request-aborted', 'the request was aborted before its body arrived'],
  'request.size.invalid': [400, 'bad-request', 'the request body does not match its Content-Length'],
};

const MULTER_ERRORS: Partial<Record<multer.MulterError['code'], [number, string]>> = {
  LIMIT_FILE_SIZE: [413, 'file-too-large'],
  LIMIT_FILE_COUNT: [400, 'too-many-files'],
  LIMIT_UNEXPECTED_FILE: [400, 'unexpected-file'],
  LIMIT_FIELD_VALUE: [413, 'field-too-large'],
};

function toAppError(err: unknown): AppError | null {
  if (err instanceof AppError) return err;
  if (err instanceof multer.MulterError) {
    const [status, code] = MULTER_ERRORS[err.code] ?? [400, 'invalid-upload'];
    return new AppError(status, code, err.code === 'LIMIT_FILE_SIZE' ? 'the file is larger than 10 MB' : err.message);
  }
  const e = err as { type?: string; status?: number; statusCode?: number; name?: string; message?: string; parent?: { code?: string } };
  if (e?.type && BODY_ERRORS[e.type]) {
    const [status, code, message] = BODY_ERRORS[e.type];
    return new AppError(status, code, message);
  }
  // SQLite stayed locked past the busy timeout: try again later, not a fault of the request.
  if (e?.name === 'SequelizeTimeoutError' || e?.parent?.code === 'SQLITE_BUSY') return new AppError(503, 'busy', 'the database is busy: try again in a moment');
  const status = e?.status ?? e?.statusCode;
  if (typeof status === 'number' && status >= 400 && status < 500) return new AppError(status, 'bad-request', e.message ?? 'bad request');
  return null;
}

/** The one place an error becomes an answer: `{ error: { code, message, details } }`. */
export const errorHandler: ErrorRequestHandler = (err, req, res, next) => {
  if (res.headersSent) return next(err);
  const known = toAppError(err);
  if (!known) {
    req.log?.error({ err }, 'unexpected error');
    res.status(500).json({ error: { code: 'internal', message: 'something went wrong on the server; it has been logged' } });
    return;
  }
  if (known.status === 401) res.set('WWW-Authenticate', 'Bearer');
  res.status(known.status).json({ error: { code: known.code, message: known.message, ...(known.details === undefined ? {} : { details: known.details }) } });
};

export const apiNotFound: RequestHandler = (req) => {
  throw new AppError(404, 'not-found', `there is no ${req.method} ${req.path} in this API`);
};

/** JSON routes: a body of another type gets 415 rather than being read as missing. */
export const requireJson: RequestHandler = (req, _res, next) => {
  const hasBody = req.get('transfer-encoding') !== undefined || Number(req.get('content-length') ?? 0) > 0;
  if (hasBody && !req.is('application/json')) throw new AppError(415, 'unsupported-media-type', 'send the body as JSON (Content-Type: application/json)');
  next();
};
