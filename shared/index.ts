// The Weir engine: pure TypeScript, no Node-only imports, so the CLI, the server and the
// browser run the very same checks.
export * from './site/types.ts';
export { parseSite, sortFindings, MAX_SITE_TEXT_CHARS, type ParsedSite } from './site/parse-site.ts';
export { formatPath, parsePath, type Locator, type PathSegment, type Position } from './site/locate.ts';
export { checkSite, countFindings, type SiteCheck } from './check-site.ts';
export { runRules, RULES } from './rules/run-rules.ts';
export type { Rule, RawFinding, RuleContext } from './rules/rule.ts';
export { summarizeSite, serviceCapacityKva, generationPerPhaseKva, totalGenerationKva, exportLimitCurrentA, effectiveVoltageLn, ctConductors, BUS_LIMIT_M, BUS_WARN_ABOVE_M, type SiteSummary, type CtFigures } from './site/summary.ts';
export { diffSites, type SiteChange } from './site/diff-sites.ts';
export { PROFILES, getProfile, type Profile } from './profiles/index.ts';
export * from './electrical/conductors.ts';
export * from './electrical/voltage.ts';
export * from './electrical/power.ts';
export * from './electrical/ct.ts';
export { SAFETY_CAUTIONS } from './cautions.ts';
