import type { JSONSchemaType } from 'ajv';
import express, { Router, type RequestHandler } from 'express';
import { AppError } from '../lib/app-error.ts';
import type { MountRoute } from '../lib/route.ts';
import { bodyChecker, idParam } from '../lib/validate.ts';
import { currentUser } from '../middleware/authorize.ts';
import { requireJson } from '../middleware/error-handler.ts';
import type { Decision } from './review.model.ts';
import type { RevisionsService } from './revisions.service.ts';

export const YAML_TYPES = ['application/yaml', 'application/x-yaml', 'text/yaml', 'text/x-yaml'];
/** Largest site file accepted; the engine's own ceiling (MAX_SITE_TEXT_CHARS) is higher. */
export const YAML_LIMIT = '512kb';
const MAX_MESSAGE_CHARS = 1000;

const requireYaml: RequestHandler = (req, _res, next) => {
  const header = req.get('content-type') ?? '';
  const [type, ...params] = header.split(';').map((s) => s.trim().toLowerCase());
  if (!YAML_TYPES.includes(type)) {
    throw new AppError(415, 'unsupported-media-type', `send the site file as YAML (Content-Type: application/yaml), not ${header ? `"${header}"` : 'without a type'}`);
  }
  const charset = params.find((p) => p.startsWith('charset='))?.slice('charset='.length).replace(/"/g, '');
  if (charset && charset !== 'utf-8' && charset !== 'utf8') throw new AppError(415, 'unsupported-charset', 'the site file must be UTF-8');
  next();
};

const readYaml = express.raw({ type: YAML_TYPES, limit: YAML_LIMIT });
const utf8 = new TextDecoder('utf-8', { fatal: true });

function decodeSiteText(body: unknown): string {
  if (!Buffer.isBuffer(body)) return '';
  try {
    return utf8.decode(body);
  } catch {
    throw new AppError(400, 'invalid-encoding', 'the site file is not valid UTF-8');
  }
}

/** The push message: `?message=` or the X-Weir-Message header (percent-encoded when not ASCII). */
function pushMessage(req: express.Request): string | null {
  const fromQuery = req.query.message;
  if (fromQuery !== undefined && typeof fromQuery !== 'string') throw new AppError(400, 'invalid-query', 'give at most one message');
  let message = fromQuery ?? req.get('x-weir-message') ?? '';
  if (fromQuery === undefined && message) {
    try {
      message = decodeURIComponent(message);
    } catch {
      // Not percent-encoded after all: keep it as sent.
    }
  }
  message = message.trim();
  if (message.length > MAX_MESSAGE_CHARS) throw new AppError(400, 'invalid-message', `the message may be at most ${MAX_MESSAGE_CHARS} characters long`);
  return message || null;
}

const reviewBody: JSONSchemaType<{ decision: Decision; comment?: string }> = {
  type: 'object',
  properties: { decision: { type: 'string', enum: ['approve', 'return'] }, comment: { type: 'string', maxLength: 4000, nullable: true } },
  required: ['decision'],
  additionalProperties: false,
};
const checkReview = bodyChecker(reviewBody);

export function revisionsRouter(mount: MountRoute, revisions: RevisionsService) {
  const router = Router();

  mount(router, 'revisions.push', requireYaml, readYaml, async (req, res) => {
    const message = pushMessage(req);
    const { revision, created } = await revisions.push(decodeSiteText(req.body), message, currentUser(req));
    res.status(created ? 201 : 200).json({ revision, created });
  });

  mount(router, 'revisions.get', async (req, res) => {
    res.json({ revision: await revisions.detail(idParam(req.params.id, 'the revision'), currentUser(req)) });
  });

  mount(router, 'revisions.review', requireJson, async (req, res) => {
    const id = idParam(req.params.id, 'the revision');
    const { decision, comment } = checkReview(req.body);
    res.json(await revisions.review(id, decision, comment, currentUser(req)));
  });

  return router;
}
