import Ajv, { type ErrorObject, type JSONSchemaType, type ValidateFunction } from 'ajv';
import siteSchema from '../../schemas/site.schema.json';
import { AppError } from './app-error.ts';

// One instance for bodies, one for query strings (whose values arrive as text and are coerced).
const bodies = new Ajv({ allErrors: true, strict: true });
const queries = new Ajv({ allErrors: true, strict: true, coerceTypes: true, useDefaults: true });

const describe = (errors: ErrorObject[] | null | undefined) =>
  (errors ?? []).map((e) => ({
    path: e.instancePath.replace(/^\//, '').replaceAll('/', '.') || (e.params as { missingProperty?: string }).missingProperty || '',
    message: e.keyword === 'additionalProperties' ? `unknown field "${(e.params as { additionalProperty: string }).additionalProperty}"` : (e.message ?? 'is not valid'),
  }));

/**
 * The first value no field of this API can use, with its path: a string (or key) holding a NUL,
 * which Sequelize's SQLite dialect would write into the SQL text of a WHERE clause, where it ends
 * the statement early; or a number that is not finite, which ajv's type coercion lets through
 * from a query string ("Infinity", "1e400") without applying minimum and maximum.
 */
function unusable(value: unknown, at: string[] = []): { path: string; message: string } | null {
  if (typeof value === 'string') return value.includes('\u0000') ? { path: at.join('.'), message: 'must not contain a NUL character' } : null;
  if (typeof value === 'number') return Number.isFinite(value) ? null : { path: at.join('.'), message: 'must be a finite number' };
  if (!value || typeof value !== 'object') return null;
  for (const [key, item] of Object.entries(value)) {
    if (key.includes('\u0000')) return { path: [...at, key].join('.'), message: 'must not contain a NUL character' };
    const found = unusable(item, [...at, key]);
    if (found) return found;
  }
  return null;
}

function refuseUnusable(value: unknown, code: 'invalid-body' | 'invalid-query', message: string) {
  const found = unusable(value);
  if (found) throw new AppError(400, code, message, [found]);
}

export interface Checker<T> {
  (value: unknown): T;
}

/** A JSON body check: a 400 `invalid-body` naming each bad field, or the typed body. */
export function bodyChecker<T>(schema: JSONSchemaType<T>): Checker<T> {
  const validate: ValidateFunction<T> = bodies.compile(schema);
  return (value) => {
    if (value === undefined) throw new AppError(400, 'invalid-body', 'the request needs a JSON body (Content-Type: application/json)');
    if (!validate(value)) throw new AppError(400, 'invalid-body', 'the request body is not valid', describe(validate.errors));
    refuseUnusable(value, 'invalid-body', 'the request body is not valid');
    return value;
  };
}

/** A query-string check: a 400 `invalid-query`, or the typed values with their defaults. */
export function queryChecker<T>(schema: JSONSchemaType<T>): Checker<T> {
  const validate: ValidateFunction<T> = queries.compile(schema);
  return (value) => {
    // Express 5 re-parses req.query on each read: validate (and coerce) a copy.
    const copy = { ...(value as object) };
    if (!validate(copy)) throw new AppError(400, 'invalid-query', 'the query parameters are not valid', describe(validate.errors));
    refuseUnusable(copy, 'invalid-query', 'the query parameters are not valid');
    return copy as T;
  };
}

/** Route ids are positive integers; anything else names nothing, hence 404. */
export function idParam(raw: string | string[] | undefined, what: string): number {
  const text = Array.isArray(raw) ? '' : (raw ?? '');
  if (!/^[1-9]\d{0,15}$/.test(text) || !Number.isSafeInteger(Number(text))) throw new AppError(404, 'not-found', `${what} was not found`);
  return Number(text);
}

export const EMAIL_PATTERN = '^[^\\s@]+@[^\\s@]+\\.[^\\s@]+$';

/** The site file's own pattern for `site.id`. */
const SITE_ID = new RegExp(siteSchema.properties.site.properties.id.pattern);

/** Site ids follow the site file's pattern; anything else names no site. */
export function siteParam(raw: string | string[] | undefined): string {
  const text = Array.isArray(raw) ? '' : (raw ?? '');
  if (!SITE_ID.test(text)) throw new AppError(404, 'not-found', 'the site was not found');
  return text;
}
