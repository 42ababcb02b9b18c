// Crash safety: the real server takes a stream of pushes and uploads, is killed with SIGKILL while
// requests are in flight (no shutdown code runs), and is started again on the same folder. The
// file must pass `PRAGMA integrity_check`, the change log must verify, every push that got a 201
// must be there, and nothing may be half-written (a revision without its change-log event, an
// attachment row without its file, a site with two pending revisions).
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { FIXTURE } from './support/hostile.ts';
import { getJson, login, pushYaml, serverCommand, startRealServer, type RealServer } from './support/real-server.ts';
import { integrityCheck, query } from './support/sqlite.ts';

/** A 1×1 PNG (signature, IHDR, IDAT, IEND); bytes after IEND make each one distinct. */
const PNG = Buffer.from('89504e470d0a1a0a0000000d49484452000000010000000108060000001f15c4890000000d49444154789c63000100000500010d0a2db40000000049454e44ae426082', 'hex');

const SITES = ['crash-a', 'crash-b', 'crash-c'];
const variant = (n: number) => FIXTURE.replace('id: mill-lane-bakery', `id: ${SITES[n % SITES.length]}`).replace('serial: EM-20931', `serial: EM-${100000 + n}`);

let dataDir: string;
let server: RealServer;
let installer: string;
let auditor: string;
/** Revision ids the server acknowledged with 201, and attachment ids with 201. */
const acknowledged = new Set<number>();
const attachments = new Set<number>();
let counter = 0;

const db = () => path.join(dataDir, 'weir.sqlite');

/**
 * Keeps `workers` requests in flight until the server dies, and kills it with SIGKILL once
 * `killAfter` more pushes have been acknowledged. Answers and connection errors are both fine;
 * only what was acknowledged is a promise.
 */
async function streamAndKill(killAfter: number, workers = 4): Promise<{ inFlightAtKill: number; refusedWhileUp: string[] }> {
  const target = acknowledged.size + killAfter;
  let killed = false;
  let inFlight = 0;
  let inFlightAtKill = 0;
  const refusedWhileUp: string[] = [];
  const worker = async (w: number) => {
    while (!killed) {
      const n = counter++;
      inFlight++;
      try {
        if (w === 0 && n % 3 === 0) {
          const form = new FormData();
          form.append('caption', `evidence ${n}`);
          form.append('file', new Blob([Buffer.concat([PNG, Buffer.from(`#${n}`)])], { type: 'image/png' }), `photo-${n}.png`);
          const res = await fetch(`${server.url}/api/sites/${SITES[0]}/attachments`, { method: 'POST', headers: { authorization: `Bearer ${installer}` }, body: form });
          const body = (await res.json()) as { attachment?: { id: number } };
          if (res.status === 201 && body.attachment) attachments.add(body.attachment.id);
          else if (!killed && res.status !== 404) refusedWhileUp.push(`upload ${res.status}`);
        } else {
          const res = await pushYaml(server.url, installer, variant(n));
          if (res.status === 201) acknowledged.add(res.body.revision.id);
          else if (!killed) refusedWhileUp.push(`push ${res.status} ${JSON.stringify(res.body).slice(0, 120)}`);
        }
      } catch {
        // The connection died with the server: not acknowledged, no promise made.
      } finally {
        inFlight--;
      }
      if (!killed && acknowledged.size >= target) {
        killed = true;
        inFlightAtKill = inFlight;
        server.child.kill('SIGKILL');
      }
    }
  };
  await Promise.all(Array.from({ length: workers }, (_, w) => worker(w)));
  await server.kill('SIGKILL');
  return { inFlightAtKill, refusedWhileUp };
}

async function checkAfterRestart() {
  server = await startRealServer(dataDir);
  expect(await integrityCheck(db())).toEqual(['ok']);

  const verify = await getJson<{ ok: boolean; events: number; firstBadEvent?: unknown }>(server.url, auditor, '/api/audit/verify');
  expect(verify.status).toBe(200);
  expect(verify.body.ok, JSON.stringify(verify.body.firstBadEvent)).toBe(true);

  const stored = new Set((await query<{ id: number }>(db(), 'SELECT id FROM revisions')).map((r) => r.id));
  const missing = [...acknowledged].filter((id) => !stored.has(id));
  expect(missing, 'acknowledged pushes lost in the crash').toEqual([]);
  for (const id of [...acknowledged].slice(-3)) expect((await getJson(server.url, auditor, `/api/revisions/${id}`)).status).toBe(200);

  // All of a push or none of it: each stored revision has its change-log event.
  const orphans = await query(db(), "SELECT r.id FROM revisions r LEFT JOIN audit_events a ON a.revision_id = r.id AND a.action = 'revision.pushed' WHERE a.seq IS NULL");
  expect(orphans).toEqual([]);
  const doublePending = await query(db(), "SELECT site_id, COUNT(*) AS n FROM revisions WHERE state = 'pending' GROUP BY site_id HAVING n > 1");
  expect(doublePending).toEqual([]);
  const stale = await query(db(), 'SELECT s.id FROM sites s WHERE s.latest_revision_id IS NOT (SELECT MAX(id) FROM revisions r WHERE r.site_id = s.id)');
  expect(stale).toEqual([]);

  // The file is written before its row: every attachment row has its bytes.
  const storedAttachments = await query<{ id: number }>(db(), 'SELECT id FROM attachments');
  expect([...attachments].filter((id) => !storedAttachments.some((a) => a.id === id))).toEqual([]);
  for (const { id } of storedAttachments) {
    const res = await fetch(`${server.url}/api/attachments/${id}/content`, { headers: { authorization: `Bearer ${auditor}` } });
    expect(res.status, `attachment ${id}`).toBe(200);
    await res.arrayBuffer();
  }

  // And it takes new work at once: no lock or journal left behind.
  const after = await pushYaml(server.url, installer, variant(counter++));
  expect(after.status).toBe(201);
  acknowledged.add(after.body.revision.id);
}

beforeAll(async () => {
  dataDir = mkdtempSync(path.join(os.tmpdir(), 'weir-crash-'));
  const seeded = await serverCommand(['seed'], dataDir);
  expect(seeded.exitCode, seeded.stderr).toBe(0);
  server = await startRealServer(dataDir);
  // Tokens outlive the process: same JWT_SECRET, same accounts.
  installer = await login(server.url, 'installer@example.test');
  auditor = await login(server.url, 'auditor@example.test');
});
afterAll(async () => {
  await server?.kill('SIGTERM');
  rmSync(dataDir, { recursive: true, force: true });
});

describe('SIGKILL mid-stream', () => {
  it('When the server is killed with pushes in flight and started again, then the file is sound, the log verifies and every 201 is there', async () => {
    const { inFlightAtKill, refusedWhileUp } = await streamAndKill(25);
    expect(inFlightAtKill, 'the kill should land with requests in flight').toBeGreaterThan(0);
    expect(refusedWhileUp).toEqual([]);
    await checkAfterRestart();
  });

  it('When it is killed a second time, sooner, then the same holds', async () => {
    const { inFlightAtKill } = await streamAndKill(6, 6);
    expect(inFlightAtKill).toBeGreaterThan(0);
    await checkAfterRestart();
    expect(acknowledged.size).toBeGreaterThanOrEqual(33);
  });
});
