import { runRules } from './rules/run-rules.ts';
import { parseSite, sortFindings } from './site/parse-site.ts';
import { summarizeSite, type SiteSummary } from './site/summary.ts';
import type { Finding, Site } from './site/types.ts';

export interface SiteCheck {
  /** Plain data read from the YAML, or null when it could not be read. */
  data: unknown;
  /** The site when it passed the schema; rules ran only then. */
  site: Site | null;
  findings: Finding[];
  summary: SiteSummary | null;
  counts: { error: number; warning: number; info: number };
}

export function countFindings(findings: readonly Finding[]) {
  const counts = { error: 0, warning: 0, info: 0 };
  for (const f of findings) counts[f.severity]++;
  return counts;
}

/**
 * The whole check of one site file, as the CLI, the server and the reviewer run it: YAML, then
 * the schema, then (only for a file that passed both) every rule. Never throws.
 */
export function checkSite(text: string, options: { careful?: boolean } = {}): SiteCheck {
  const parsed = parseSite(text, options);
  let findings = parsed.findings;
  let summary: SiteSummary | null = null;
  if (parsed.site) {
    findings = sortFindings([...findings, ...runRules(parsed.site, parsed.locate)]);
    try {
      summary = summarizeSite(parsed.site);
    } catch {
      summary = null;
    }
  }
  return { data: parsed.data, site: parsed.site, findings, summary, counts: countFindings(findings) };
}
