// Reading a site and its revisions from the server.
import type { ApiClient } from './api-client.ts';
import type { Revision, SiteAnswer } from './api-types.ts';
import { ApiError, CliError } from './errors.ts';
import { SITE_ID_PATTERN_TEXT } from './site-id.ts';

export function checkSiteIdArgument(id: string): string {
  if (!new RegExp(SITE_ID_PATTERN_TEXT).test(id)) throw new CliError(`${id} is not a site id`, 2, 'a site id is 2 to 63 lower-case letters, digits and hyphens, like mill-lane-bakery');
  return id;
}

/** The site, its approved and latest revision; null when the server has no such site. */
export async function fetchSite(client: ApiClient, id: string): Promise<SiteAnswer | null> {
  try {
    return await client.get<SiteAnswer>(`/api/sites/${encodeURIComponent(id)}`);
  } catch (err) {
    if (err instanceof ApiError && err.status === 404) return null;
    throw err;
  }
}

/** A revision's site file text (lists and the site route leave it out). */
export async function revisionText(client: ApiClient, revision: Revision): Promise<string> {
  if (typeof revision.yaml === 'string') return revision.yaml;
  const { revision: full } = await client.get<{ revision: Revision }>(`/api/revisions/${revision.id}`);
  if (typeof full.yaml !== 'string') throw new ApiError(200, 'bad-answer', `revision ${revision.id} came without its text`);
  return full.yaml;
}

/** `2026-05-01 08:30 UTC` */
export function when(iso: string | null | undefined): string {
  if (!iso) return '';
  const d = new Date(iso);
  return Number.isNaN(d.getTime()) ? iso : `${d.toISOString().slice(0, 16).replace('T', ' ')} UTC`;
}
