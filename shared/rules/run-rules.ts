import { liveConductors } from '../electrical/conductors.ts';
import { getProfile } from '../profiles/index.ts';
import { formatPath, type Locator } from '../site/locate.ts';
import { sortFindings } from '../site/parse-site.ts';
import { effectiveVoltageLn } from '../site/summary.ts';
import type { Finding, Site } from '../site/types.ts';
import type { Rule, RuleContext } from './rule.ts';
import { serviceRules } from './service.ts';
import { exportRules } from './export.ts';
import { meterRules } from './meter.ts';
import { ctRules } from './cts.ts';
import { busRules } from './bus.ts';
import { generationRules } from './generation.ts';
import { commissioningRules } from './commissioning.ts';

/** Every rule of rules.md, version 1, in the order of that page. */
export const RULES: readonly Rule[] = [
  ...serviceRules, ...exportRules, ...meterRules, ...ctRules, ...busRules, ...generationRules, ...commissioningRules,
];

const noLocation: Locator = () => ({ line: 1, column: 1 });

/**
 * Runs every rule on a site that passed the schema and returns the findings sorted by line.
 * Without a locator (a site that did not come from YAML text) every finding is at 1:1.
 */
export function runRules(site: Site, locate: Locator = noLocation): Finding[] {
  const ctx: RuleContext = {
    site,
    profile: getProfile(site.agreement.profile),
    live: liveConductors(site.service.arrangement),
    voltageLn: effectiveVoltageLn(site),
  };
  const findings: Finding[] = [];
  for (const rule of RULES) {
    let raw;
    try {
      raw = rule.check(ctx);
    } catch (err) {
      // A rule that throws is a bug in Weir, not in the site: say so rather than stop the check.
      findings.push({ ruleId: rule.id, severity: 'error', message: `internal error in rule ${rule.id}: ${(err as Error)?.message ?? String(err)}; please report it`, path: '', line: 1, column: 1 });
      continue;
    }
    for (const r of raw) {
      const { line, column } = locate(r.at);
      const finding: Finding = { ruleId: rule.id, severity: r.severity ?? rule.severity, message: r.message, path: formatPath(r.at), line, column };
      const source = r.source ?? rule.source;
      if (source) finding.source = source;
      if (r.hint) finding.hint = r.hint;
      findings.push(finding);
    }
  }
  return sortFindings(findings);
}
