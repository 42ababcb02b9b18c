/** site.id in the schema: lower-case letters, digits and hyphens, 2 to 63 characters. */
export const SITE_ID_PATTERN_TEXT = '^[a-z0-9][a-z0-9-]{1,62}$';

/** The site id of parsed site data, when it has one that is a string. */
export function siteIdOf(data: unknown): string | null {
  if (!data || typeof data !== 'object') return null;
  const site = (data as { site?: unknown }).site;
  if (!site || typeof site !== 'object') return null;
  const id = (site as { id?: unknown }).id;
  return typeof id === 'string' ? id : null;
}
