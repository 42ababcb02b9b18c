import type { Profile } from '../profiles/index.ts';
import type { PathSegment } from '../site/locate.ts';
import type { LiveConductor, Severity, Site } from '../site/types.ts';

/** What every rule sees: the site and what is derived from it once for all rules. */
export interface RuleContext {
  site: Site;
  profile: Profile;
  live: LiveConductor[];
  /** V_LN, or V_LL/√3 for a 3-wire service without neutral. */
  voltageLn: number;
}

/** A rule's result before it is placed in the file. */
export interface RawFinding {
  at: PathSegment[];
  message: string;
  /** Defaults to the rule's own severity. */
  severity?: Severity;
  hint?: string;
  source?: string;
}

export interface Rule {
  id: string;
  severity: Severity;
  /** One line for lists and documentation. */
  title: string;
  /** Where the rule's numbers come from. */
  source?: string;
  check(ctx: RuleContext): RawFinding[];
}

export const defineRule = (rule: Rule): Rule => rule;

/** Rounds for messages: at most `digits` decimals, no trailing zeros. */
export function fmt(value: number, digits = 2): string {
  if (!Number.isFinite(value)) return String(value);
  return String(Number(value.toFixed(digits)));
}
