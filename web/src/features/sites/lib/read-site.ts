// The stored revision's YAML as a Site, for the diagram and the chart. The server only stores
// revisions that passed the schema; the checks here just keep a damaged text from breaking a page.
import { parse } from 'yaml';
import type { Site } from '../../../../../shared/site/types.ts';

export function readSite(text: string | null | undefined): Site | null {
  if (!text) return null;
  try {
    const data = parse(text, { maxAliasCount: 100 }) as Partial<Site> | null;
    if (!data || typeof data !== 'object' || !data.meter || !Array.isArray(data.cts) || !Array.isArray(data.generation) || !data.service) return null;
    return data as Site;
  } catch {
    return null;
  }
}
