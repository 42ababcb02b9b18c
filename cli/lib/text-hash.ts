import { createHash } from 'node:crypto';

/**
 * The sha256 the server stores for a site file's text. The server decodes the body with a UTF-8
 * decoder that drops a leading byte-order mark, so the local text is hashed without one too.
 */
export function siteTextSha256(text: string): string {
  return createHash('sha256').update(text.replace(/^\uFEFF/, ''), 'utf8').digest('hex');
}
