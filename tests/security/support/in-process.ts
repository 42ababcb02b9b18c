// The app in this process (as the API tests build it, tests/api/helpers.ts), plus what the
// security tests need on top: one account per role signed in once, and counts of stored state.
import { readdir } from 'node:fs/promises';
import path from 'node:path';
import { QueryTypes } from 'sequelize';
import { ROLES, type Role } from '../../../server/auth/permissions.ts';
import { account, startWeir, type Account, type TestWeir } from '../../api/helpers.ts';

export { PASSWORD, push, review, siteText, startWeir, account, type Account, type TestWeir } from '../../api/helpers.ts';

/** One account of each role, signed in once: bcrypt makes sign-ins slow, so tokens are reused. */
export async function accountsByRole(weir: TestWeir): Promise<Record<Role, Account>> {
  const out = {} as Record<Role, Account>;
  for (const role of ROLES) out[role] = await account(weir, role);
  return out;
}

async function countFiles(dir: string): Promise<number> {
  try {
    let n = 0;
    for (const entry of await readdir(dir, { withFileTypes: true })) {
      n += entry.isDirectory() ? await countFiles(path.join(dir, entry.name)) : 1;
    }
    return n;
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'ENOENT') return 0;
    throw err;
  }
}

/**
 * Rows per table and files in the upload store. Failed sign-ins are left out of the change
 * log's count: they are state changes that must be logged (the documented exception).
 */
export async function state(weir: TestWeir): Promise<Record<string, number>> {
  const q = (sql: string) => weir.runtime.db.sequelize.query<{ n: number }>(sql, { type: QueryTypes.SELECT });
  const out: Record<string, number> = {};
  for (const table of ['users', 'sites', 'revisions', 'reviews', 'attachments']) out[table] = (await q(`SELECT COUNT(*) AS n FROM ${table}`))[0].n;
  out.audit_events = (await q("SELECT COUNT(*) AS n FROM audit_events WHERE action <> 'auth.login-failed'"))[0].n;
  out.uploads = await countFiles(weir.config.uploadsDir);
  return out;
}

