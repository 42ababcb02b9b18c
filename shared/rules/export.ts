import { serviceCapacityKva, totalGenerationKva } from '../site/summary.ts';
import { defineRule, fmt, type RawFinding } from './rule.ts';

export const exportLimitOverAgreement = defineRule({
  id: 'export-limit-over-agreement',
  severity: 'error',
  title: 'The gateway\'s export limit is within the agreed limit',
  source: 'the connection agreement (agreement.exportLimitKw)',
  check({ site }) {
    const limit = site.export.limitKw;
    const agreed = site.agreement.exportLimitKw;
    if (!(limit > agreed)) return [];
    return [{
      at: ['export', 'limitKw'],
      message: `export.limitKw ${fmt(limit, 3)} kW is more than the agreed ${fmt(agreed, 3)} kW`,
      // The W hint only for a slip of units: /1000 fits, and the value is far above the agreement
      // (6 for 5 kW is a wrong number, not watts).
      hint: limit / 1000 <= agreed && limit >= 100 * agreed ? `kW typed as W? ${fmt(limit, 3)} W is ${fmt(limit / 1000, 3)} kW` : 'set the gateway\'s limit at or below the agreement',
    }];
  },
});

export const exportLimitOverService = defineRule({
  id: 'export-limit-over-service',
  severity: 'error',
  title: 'The export limit fits the service capacity',
  source: 'S_svc = √3·V_LL·I (three-phase), V_LL·I (split-phase), V_LN·I (single-phase)',
  check({ site }) {
    const capacity = serviceCapacityKva(site);
    if (!(site.export.limitKw > capacity)) return [];
    return [{
      at: ['export', 'limitKw'],
      message: `export.limitKw ${fmt(site.export.limitKw, 3)} kW is more than the service can carry: ${fmt(capacity, 2)} kVA at ${fmt(site.service.mainBreakerA)} A`,
      hint: 'check the units of limitKw and service.mainBreakerA',
    }];
  },
});

export const exportControlDisabled = defineRule({
  id: 'export-control-disabled',
  severity: 'error',
  title: 'Export control is on when the generation can exceed the agreed limit',
  check({ site }) {
    const g = totalGenerationKva(site);
    if (site.export.control !== 'disabled' || !(g > site.agreement.exportLimitKw)) return [];
    return [{
      at: ['export', 'control'],
      message: `export control is disabled, but the generation (${fmt(g, 3)} kVA) can exceed the agreed ${fmt(site.agreement.exportLimitKw, 3)} kW`,
      hint: 'set export.control to enabled',
    }];
  },
});

export const exportControlUnneeded = defineRule({
  id: 'export-control-unneeded',
  severity: 'info',
  title: 'The generation cannot exceed the agreed limit',
  check({ site }) {
    const g = totalGenerationKva(site);
    if (!(g <= site.agreement.exportLimitKw)) return [];
    return [{
      at: ['agreement', 'exportLimitKw'],
      message: `the generation (${fmt(g, 3)} kVA) cannot exceed the agreed ${fmt(site.agreement.exportLimitKw, 3)} kW: export control is not needed to keep the limit`,
    }];
  },
});

export const exportPerPhaseIncomplete = defineRule({
  id: 'export-per-phase-incomplete',
  severity: 'error',
  title: 'Per-phase limits cover every live conductor and add up to no more than the limit',
  check({ site, live }) {
    if (site.export.scope !== 'per-phase') return [];
    const perPhase = site.export.perPhaseLimitKw ?? {};
    const out: RawFinding[] = [];
    const missing = live.filter((c) => perPhase[c] === undefined);
    if (missing.length > 0) {
      out.push({ at: ['export', 'perPhaseLimitKw'], message: `scope is per-phase but perPhaseLimitKw has no limit for ${missing.join(', ')}` });
    }
    const sum = live.reduce((s, c) => s + (perPhase[c] ?? 0), 0);
    if (sum > site.export.limitKw + 1e-9) {
      out.push({ at: ['export', 'perPhaseLimitKw'], message: `the per-phase limits add up to ${fmt(sum, 3)} kW, more than export.limitKw ${fmt(site.export.limitKw, 3)} kW` });
    }
    return out;
  },
});

export const failsafeTooSlow = defineRule({
  id: 'failsafe-too-slow',
  severity: 'error',
  title: 'The fail-safe acts within the profile\'s response time',
  check({ site, profile }) {
    const after = site.export.failSafe.afterS;
    if (profile.maxResponseS === null) {
      return [{ at: ['export', 'failSafe', 'afterS'], severity: 'info', message: `fail-safe delay not checked: a maximum response time is not set by this profile (${profile.id})`, source: profile.sources.maxResponseS }];
    }
    if (!(after > profile.maxResponseS)) return [];
    return [{
      at: ['export', 'failSafe', 'afterS'],
      message: `the fail-safe acts after ${fmt(after)} s; profile ${profile.id} allows at most ${fmt(profile.maxResponseS)} s`,
      source: profile.sources.maxResponseS,
    }];
  },
});

export const exportRules = [exportLimitOverAgreement, exportLimitOverService, exportControlDisabled, exportControlUnneeded, exportPerPhaseIncomplete, failsafeTooSlow];
