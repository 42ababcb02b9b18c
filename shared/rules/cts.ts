import { DEFAULT_METER_INPUT_BURDEN_VA, leadBurdenVa, lowestDefinedPercent, ratioErrorLimitPercent } from '../electrical/ct.ts';
import { ctConductors, effectiveVoltageLn, exportLimitCurrentA } from '../site/summary.ts';
import { defineRule, fmt, type RawFinding } from './rule.ts';

export const ctUndersized = defineRule({
  id: 'ct-undersized',
  severity: 'error',
  title: 'Each CT is rated for the main breaker\'s current',
  source: 'common practice: a CT\'s rated primary current is at least the main breaker rating',
  check({ site }) {
    return site.cts.flatMap((ct, i): RawFinding[] => ct.ratedPrimaryA < site.service.mainBreakerA ? [{
      at: ['cts', i, 'ratedPrimaryA'],
      message: `CT ${ct.id} is rated ${fmt(ct.ratedPrimaryA)} A, less than the ${fmt(site.service.mainBreakerA)} A main breaker`,
      hint: `choose a CT of at least ${fmt(site.service.mainBreakerA)} A`,
    }] : []);
  },
});

export const ctMixedRatio = defineRule({
  id: 'ct-mixed-ratio',
  severity: 'error',
  title: 'All CTs on the meter have one ratio',
  source: 'a meter takes one CT ratio for all its current inputs',
  check({ site }) {
    const used = new Set([...ctConductors(site).keys()]);
    const onMeter = site.cts.map((ct, i) => ({ ct, i })).filter(({ ct }) => used.size === 0 || used.has(ct.id));
    if (onMeter.length < 2) return [];
    const first = onMeter[0].ct;
    const odd = onMeter.find(({ ct }) => ct.ratedPrimaryA !== first.ratedPrimaryA || ct.secondary !== first.secondary);
    if (!odd) return [];
    const ratios = [...new Set(onMeter.map(({ ct }) => `${fmt(ct.ratedPrimaryA)}/${ct.secondary}`))].join(', ');
    return [{
      at: ['cts', odd.i, odd.ct.ratedPrimaryA !== first.ratedPrimaryA ? 'ratedPrimaryA' : 'secondary'],
      message: `the meter's CTs differ in ratio (${ratios}); a meter is set to one ratio`,
      hint: 'fit matching CTs on every conductor',
    }];
  },
});

export const ctLowAccuracyAtLimit = defineRule({
  id: 'ct-low-accuracy-at-limit',
  severity: 'warning',
  title: 'The current at the export limit is within the CT class\'s defined range',
  source: 'IEC 61869-2:2012 Tables 201/202',
  check({ site, live }) {
    const conductors = ctConductors(site);
    const perPhase = exportLimitCurrentA(site);
    const aggregate = (site.export.limitKw * 1000) / (live.length * effectiveVoltageLn(site));
    const out: RawFinding[] = [];
    site.cts.forEach((ct, i) => {
      const conductor = conductors.get(ct.id);
      if (conductor === 'N') return;
      const current = conductor ? perPhase[conductor] : aggregate;
      if (current === undefined) return;
      const percent = (current / ct.ratedPrimaryA) * 100;
      const lowest = lowestDefinedPercent(ct.accuracyClass);
      if (!(percent < lowest)) return;
      const limit = ratioErrorLimitPercent(ct.accuracyClass, percent);
      out.push({
        at: ['cts', i, 'ratedPrimaryA'],
        message: `at the export limit CT ${ct.id} carries ${fmt(current, 2)} A, ${fmt(percent, 2)} % of its rated ${fmt(ct.ratedPrimaryA)} A: below the ${lowest} % from which class ${ct.accuracyClass}'s ratio error is defined${limit === null ? ' (no ratio-error limit applies there)' : ` (±${fmt(limit, 2)} %)`}`,
        hint: 'a smaller CT, or an S-class CT, measures small currents better',
      });
    });
    return out;
  },
});

export const ctBurdenExceeded = defineRule({
  id: 'ct-burden-exceeded',
  severity: 'error',
  title: 'The leads and the meter input stay within the CT\'s rated burden',
  source: 'IEC 60228:2004 class 2 copper resistance; IEC 61869-2:2012 rated output; meter input 0.1 VA by default (from memory)',
  check({ site }) {
    const inputBurden = site.meter.inputBurdenVa ?? DEFAULT_METER_INPUT_BURDEN_VA;
    return site.cts.flatMap((ct, i): RawFinding[] => {
      if (!ct.lead || ct.ratedBurdenVa === undefined) return [];
      const lead = leadBurdenVa(ct.secondary, ct.lead);
      if (lead === null) return [];
      const total = lead + inputBurden;
      if (!(total > ct.ratedBurdenVa)) return [];
      return [{
        at: ['cts', i, 'lead'],
        message: `CT ${ct.id}: the burden is ${fmt(total, 3)} VA (leads ${fmt(lead, 3)} VA + meter ${fmt(inputBurden, 3)} VA), more than its rated ${fmt(ct.ratedBurdenVa, 3)} VA`,
        hint: 'shorten the leads, use a larger cross-section, or choose a CT with a higher rated burden',
      }];
    });
  },
});

export const ctArrowTowardGrid = defineRule({
  id: 'ct-arrow-toward-grid',
  severity: 'warning',
  title: 'Each CT\'s arrow points toward the load',
  source: 'common practice: the arrow (P1 to P2) points the way import current flows, from the grid toward the loads',
  check({ site }) {
    return site.cts.flatMap((ct, i): RawFinding[] => ct.arrow === 'toward-grid' ? [{
      at: ['cts', i, 'arrow'],
      message: `CT ${ct.id} points toward the grid: the meter will read import as export`,
      hint: 'turn the CT round, or confirm the sign with commissioning readings',
    }] : []);
  },
});

export const ctRules = [ctUndersized, ctMixedRatio, ctLowAccuracyAtLimit, ctBurdenExceeded, ctArrowTowardGrid];
