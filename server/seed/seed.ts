import { readFile, readdir } from 'node:fs/promises';
import path from 'node:path';
import { parseDocument } from 'yaml';
import { checkSite, type Finding } from '../../shared/index.ts';
import { AuditEvent } from '../audit/audit-event.model.ts';
import { createServices } from '../services.ts';
import type { Runtime } from '../runtime.ts';
import { Site } from '../sites/site.model.ts';
import { User } from '../users/user.model.ts';
import { DEMO_ACCOUNTS } from './demo-accounts.ts';

const HOUR = 3600_000;
/** The invented history starts this long ago. */
const HISTORY_SPAN_MS = 21 * 24 * HOUR;

type Scenario = 'approved' | 'approved-then-pending' | 'superseded-then-approved' | 'pending' | 'returned' | 'superseded';

// Clean files can be approved; files with errors can only wait or be returned.
const CLEAN_SCENARIOS: Scenario[] = ['approved', 'approved-then-pending', 'superseded-then-approved', 'approved', 'pending'];
const FAULTY_SCENARIOS: Scenario[] = ['returned', 'pending', 'superseded'];

interface SiteFile {
  id: string;
  file: string;
  text: string;
  errors: Finding[];
}

/**
 * An earlier version of a site file: one inverter fewer in its first generation group, so the
 * review shows a real change. Null when that would not give a file of the same standing.
 */
function earlierVersion(file: SiteFile): { text: string; change: string } | null {
  const doc = parseDocument(file.text);
  const units = doc.getIn(['generation', 0, 'units']);
  const group = doc.getIn(['generation', 0, 'id']);
  if (typeof units !== 'number' || units < 2) return null;
  doc.setIn(['generation', 0, 'units'], units - 1);
  const text = doc.toString();
  const check = checkSite(text);
  if (!check.site || check.counts.error !== file.errors.length) return null;
  return { text, change: `Added one inverter to ${String(group)}` };
}

export interface SeedOptions {
  examplesDir: string;
  password: string;
  log?: (line: string) => void;
}

export interface SeedResult {
  accountsCreated: number;
  sitesSeeded: { id: string; scenario: Scenario }[];
  skipped: { file: string; reason: string }[];
}

/**
 * Demo data through the real services, so the change log is a real chain: the demo accounts,
 * then each example site with a short history. Idempotent: accounts and sites that exist are
 * left alone, so a second run adds only what is new.
 */
export async function seedDemo(runtime: Runtime, { examplesDir, password, log = () => undefined }: SeedOptions): Promise<SeedResult> {
  // A clock that walks forward from three weeks ago (or from the last event, if later).
  const last = await AuditEvent.findOne({ order: [['seq', 'DESC']], attributes: ['at'] });
  let clock = Math.max(Date.now() - HISTORY_SPAN_MS, last ? Date.parse(last.at) + 60_000 : 0);
  let step = 0;
  const tick = () => {
    // 1 to 9 hours between steps, never past the present.
    clock = Math.min(clock + HOUR * (1 + ((step++ * 7) % 9)), Date.now() - 60_000);
    return new Date(clock);
  };
  const services = createServices({ ...runtime, now: () => new Date(clock) });

  const result: SeedResult = { accountsCreated: 0, sitesSeeded: [], skipped: [] };
  const people = new Map<string, User>();
  for (const a of DEMO_ACCOUNTS) {
    let user = await User.findOne({ where: { email: a.email } });
    if (!user) {
      tick();
      user = await services.users.create({ ...a, password }, null);
      result.accountsCreated++;
    }
    people.set(a.email, user);
  }
  const person = (email: string) => people.get(email)!;
  const installer = person('installer@example.test');
  const installer2 = person('installer2@example.test');
  const lead = person('lead@example.test');
  const lead2 = person('lead2@example.test');

  let names: string[] = [];
  try {
    names = (await readdir(examplesDir)).filter((n) => /\.ya?ml$/.test(n)).sort();
  } catch {
    log(`no examples folder at ${examplesDir}: accounts only`);
  }
  const clean: SiteFile[] = [];
  const faulty: SiteFile[] = [];
  for (const name of names) {
    const text = await readFile(path.join(examplesDir, name), 'utf8');
    const check = checkSite(text);
    if (!check.site) {
      result.skipped.push({ file: name, reason: 'does not parse or fails the schema' });
      continue;
    }
    if (await Site.findByPk(check.site.site.id, { attributes: ['id'] })) {
      result.skipped.push({ file: name, reason: 'already seeded' });
      continue;
    }
    const errors = check.findings.filter((f) => f.severity === 'error');
    (errors.length ? faulty : clean).push({ id: check.site.site.id, file: name, text, errors });
  }

  const push = async (text: string, who: User, message: string) => {
    tick();
    return (await services.revisions.push(text, message, who)).revision;
  };
  const approve = async (id: number, who: User, comment: string | undefined) => {
    tick();
    await services.revisions.review(id, 'approve', comment, who);
  };

  const play = async (f: SiteFile, scenario: Scenario, i: number) => {
    // Alternate who does what, so the log shows more than one pair of hands.
    const [author, otherAuthor] = i % 2 ? [installer2, installer] : [installer, installer2];
    const reviewer = i % 3 === 1 ? lead2 : lead;
    const earlier = earlierVersion(f);
    switch (scenario) {
      case 'approved': {
        const r = await push(f.text, author, 'Site file as designed');
        await approve(r.id, reviewer, 'Checked against the single-line diagram.');
        break;
      }
      case 'approved-then-pending': {
        if (earlier) {
          const first = await push(earlier.text, author, 'Site file as designed');
          await approve(first.id, reviewer, undefined);
          await push(f.text, otherAuthor, earlier.change);
        } else {
          await push(f.text, author, 'Site file as designed');
        }
        break;
      }
      case 'superseded-then-approved': {
        if (earlier) await push(earlier.text, author, 'First draft');
        const r = await push(f.text, author, earlier ? `${earlier.change} before review` : 'Site file as designed');
        await approve(r.id, reviewer, 'Looks right.');
        break;
      }
      case 'pending':
        await push(f.text, author, 'Ready for review');
        break;
      case 'superseded':
        if (earlier) await push(earlier.text, author, 'First draft');
        await push(f.text, author, earlier ? earlier.change : 'Ready for review');
        break;
      case 'returned': {
        const r = await push(f.text, author, 'Ready for review');
        const e = f.errors[0];
        tick();
        await services.revisions.review(r.id, 'return', `Line ${e.line}: ${e.message} (${e.ruleId}). Please correct it and push again.`, reviewer);
        break;
      }
    }
    return scenario;
  };

  for (const [files, scenarios] of [
    [clean, CLEAN_SCENARIOS],
    [faulty, FAULTY_SCENARIOS],
  ] as const) {
    for (const [i, f] of files.entries()) {
      const scenario = await play(f, scenarios[i % scenarios.length], i);
      result.sitesSeeded.push({ id: f.id, scenario });
      log(`seeded ${f.id} (${scenario})`);
    }
  }
  return result;
}
