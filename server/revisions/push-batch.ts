import type { Transaction } from 'sequelize';
import type { SiteCheck, Site as SiteDocument } from '../../shared/index.ts';
import { HEAD_SQL, type AuditInput, type AuditService, type ChainHead } from '../audit/audit.service.ts';
import type { Database, Issued } from '../db.ts';
import { toStoredDate } from '../lib/stored-date.ts';
import { deriveSiteStatus } from '../sites/site.model.ts';
import type { User } from '../users/user.model.ts';
import { Revision } from './revision.model.ts';

/** Pushes stored in one go, at most; SQLite's bound-parameter limit is far above what they need. */
export const PUSH_BATCH_MAX = 64;

/** A push that has passed the engine and waits to be stored. */
export interface PushInput {
  text: string;
  message: string | null;
  author: User;
  doc: SiteDocument;
  check: SiteCheck;
  sha256: string;
}

/** What a push stored, or the revision that already held the same text. */
export type StoredPush =
  | { id: number; created: false }
  | {
      id: number;
      created: true;
      revision: Revision;
      site: { name: string; approvedRevisionId: number | null };
      documentJson: string;
      base: { id: number; number: number; document: SiteDocument } | null;
    };

interface SiteState {
  exists: boolean;
  name: string;
  approvedRevisionId: number | null;
  base: { id: number; number: number; document: SiteDocument } | null;
  lastNumber: number;
  /** Pending revisions: one at most once this batch has pushed to the site. */
  pending: { id: number; number: number }[];
  /** Texts the site already has, by SHA-256, with their revision. */
  shas: Map<string, number>;
  /** Made by this batch. */
  created: boolean;
  /** The site row as the batch leaves it, when the batch pushed to it. */
  latest: { revisionId: number; errorCount: number; warningCount: number; authorId: number } | null;
}

const marks = (n: number) => Array.from({ length: n }, () => '?').join(', ');
const actorOf = (u: User) => ({ id: u.id, email: u.email });

/**
 * Stores a batch of pushes in the write transaction `t`: one round of reads for every site of
 * the batch, then every write issued at once (multi-row statements), unawaited. Pushes are taken
 * in order, so a site pushed twice in one batch comes out as it would from two pushes one after
 * the other: the second supersedes the first, and the same text twice is one revision.
 */
export async function storeBatch(db: Database, audit: AuditService, t: Transaction, at: Date, batch: PushInput[]): Promise<Issued<StoredPush[]>> {
  const sql = db.sql(t);
  const atText = toStoredDate(at);
  const ids = [...new Set(batch.map((p) => p.doc.site.id))];
  const shas = [...new Set(batch.map((p) => p.sha256))];
  const inSites = `site_id IN (${marks(ids.length)})`;

  const [globals, siteRows, sameRows, lastRows, pendingRows] = await Promise.all([
    sql.get<{ revisionSeq: number | null; maxRevisionId: number | null; headSeq: number | null; headHash: string | null }>(
      `SELECT (SELECT seq FROM sqlite_sequence WHERE name = 'revisions') AS revisionSeq, (SELECT max(id) FROM revisions) AS maxRevisionId, h.seq AS headSeq, h.hash AS headHash
         FROM (SELECT 1) LEFT JOIN (${HEAD_SQL}) h`,
    ),
    sql.all<{ id: string; name: string; approvedRevisionId: number | null; baseNumber: number | null; baseDocument: string | null }>(
      `SELECT s.id, s.name, s.approved_revision_id AS approvedRevisionId, b.number AS baseNumber, b.document AS baseDocument
         FROM sites s LEFT JOIN revisions b ON b.id = s.approved_revision_id WHERE s.id IN (${marks(ids.length)})`,
      ids,
    ),
    sql.all<{ siteId: string; sha256: string; id: number }>(`SELECT site_id AS siteId, sha256, id FROM revisions WHERE ${inSites} AND sha256 IN (${marks(shas.length)})`, [...ids, ...shas]),
    sql.all<{ siteId: string; n: number }>(`SELECT site_id AS siteId, max(number) AS n FROM revisions WHERE ${inSites} GROUP BY site_id`, ids),
    sql.all<{ siteId: string; id: number; number: number }>(`SELECT site_id AS siteId, id, number FROM revisions WHERE ${inSites} AND state = 'pending' ORDER BY id`, ids),
  ]);

  const sites = new Map<string, SiteState>();
  for (const id of ids) sites.set(id, { exists: false, created: false, name: '', approvedRevisionId: null, base: null, lastNumber: 0, pending: [], shas: new Map(), latest: null });
  for (const r of siteRows) {
    Object.assign(sites.get(r.id)!, {
      exists: true,
      name: r.name,
      approvedRevisionId: r.approvedRevisionId,
      base: r.approvedRevisionId === null ? null : { id: r.approvedRevisionId, number: r.baseNumber!, document: JSON.parse(r.baseDocument!) as SiteDocument },
    });
  }
  for (const r of sameRows) sites.get(r.siteId)!.shas.set(r.sha256, r.id);
  for (const r of lastRows) sites.get(r.siteId)!.lastNumber = r.n;
  for (const r of pendingRows) sites.get(r.siteId)!.pending.push({ id: r.id, number: r.number });

  // AUTOINCREMENT: one past the highest id ever given. Named up front, so that the writes
  // need not wait for each insert to learn its id.
  let nextId = Math.max(globals?.revisionSeq ?? 0, globals?.maxRevisionId ?? 0) + 1;
  const head: ChainHead | null = globals?.headSeq == null ? null : { seq: globals.headSeq, hash: globals.headHash! };

  const results: StoredPush[] = [];
  const revisionRows: { params: (string | number | null)[]; id: number }[] = [];
  const superseded: number[] = [];
  const events: AuditInput[] = [];
  for (const p of batch) {
    const siteId = p.doc.site.id;
    const site = sites.get(siteId)!;
    const same = site.shas.get(p.sha256);
    if (same !== undefined) {
      results.push({ id: same, created: false });
      continue;
    }
    if (!site.exists) {
      site.exists = true;
      site.created = true;
      site.name = p.doc.site.name;
      events.push({ action: 'site.created', actor: actorOf(p.author), siteId, details: { name: p.doc.site.name } });
    }
    const id = nextId++;
    const number = ++site.lastNumber;
    const fields = {
      id,
      siteId,
      number,
      yaml: p.text,
      sha256: p.sha256,
      document: p.doc,
      findings: p.check.findings,
      summary: p.check.summary ?? null,
      errorCount: p.check.counts.error,
      warningCount: p.check.counts.warning,
      infoCount: p.check.counts.info,
      authorId: p.author.id,
      message: p.message,
      parentId: site.approvedRevisionId,
      state: 'pending' as const,
      decidedAt: null,
      decidedById: null,
      createdAt: at,
    };
    const documentJson = JSON.stringify(p.doc);
    revisionRows.push({
      id,
      params: [id, siteId, number, p.text, p.sha256, documentJson, JSON.stringify(fields.findings), fields.summary === null ? null : JSON.stringify(fields.summary), fields.errorCount, fields.warningCount, fields.infoCount, p.author.id, p.message, site.approvedRevisionId, atText],
    });
    events.push({
      action: 'revision.pushed',
      actor: actorOf(p.author),
      siteId,
      revisionId: id,
      details: { number, sha256: p.sha256, message: p.message, parentId: site.approvedRevisionId, errorCount: fields.errorCount, warningCount: fields.warningCount, infoCount: fields.infoCount },
    });
    // One revision awaits review per site: the newer push replaces the older.
    for (const old of site.pending) {
      superseded.push(old.id);
      events.push({ action: 'revision.superseded', actor: actorOf(p.author), siteId, revisionId: old.id, details: { number: old.number, supersededBy: id } });
    }
    site.pending = [{ id, number }];
    site.shas.set(p.sha256, id);
    // The file names the site until a revision is approved; then the approved one does.
    if (site.approvedRevisionId === null) site.name = p.doc.site.name;
    site.latest = { revisionId: id, errorCount: fields.errorCount, warningCount: fields.warningCount, authorId: p.author.id };
    results.push({
      id,
      created: true,
      revision: Revision.build(fields, { isNewRecord: false, raw: true }),
      site: { name: site.name, approvedRevisionId: site.approvedRevisionId },
      documentJson,
      base: site.base,
    });
  }

  const writes: Promise<unknown>[] = [];
  const touched = [...sites.entries()].filter(([, s]) => s.latest);
  // A new site goes in as the batch leaves it, but for its latest revision (which must exist
  // first): the update after the revisions then changes no indexed column of it.
  const created = touched.filter(([, s]) => s.created);
  const row = ([id, s]: [string, SiteState]) => [id, s.name, deriveSiteStatus('pending', s.approvedRevisionId), s.latest!.errorCount, s.latest!.warningCount, s.latest!.authorId];
  if (created.length) {
    writes.push(
      sql.run(
        `INSERT INTO sites (id, name, status, latest_state, approved_revision_id, latest_revision_id, error_count, warning_count, updated_by_id, created_at, updated_at)
         VALUES ${created.map(() => "(?, ?, ?, 'pending', NULL, NULL, ?, ?, ?, ?, ?)").join(', ')}`,
        created.flatMap((c) => [...row(c), atText, atText]),
      ),
    );
  }
  if (revisionRows.length) {
    writes.push(
      sql.run(
        `INSERT INTO revisions (id, site_id, number, yaml, sha256, document, findings, summary, error_count, warning_count, info_count, author_id, message, parent_id, state, decided_at, decided_by_id, created_at)
         VALUES ${revisionRows.map(() => "(?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, 'pending', NULL, NULL, ?)").join(', ')}`,
        revisionRows.flatMap((r) => r.params),
      ),
    );
  }
  if (superseded.length) writes.push(sql.run(`UPDATE revisions SET state = 'superseded', decided_at = ? WHERE id IN (${marks(superseded.length)})`, [atText, ...superseded]));
  if (created.length) {
    writes.push(
      sql.run(
        `UPDATE sites SET latest_revision_id = v.column2 FROM (VALUES ${created.map(() => '(?, ?)').join(', ')}) AS v WHERE sites.id = v.column1`,
        created.flatMap(([id, s]) => [id, s.latest!.revisionId]),
      ),
    );
  }
  const existing = touched.filter(([, s]) => !s.created);
  if (existing.length) {
    writes.push(
      sql.run(
        `UPDATE sites SET name = v.column2, status = v.column3, error_count = v.column4, warning_count = v.column5, updated_by_id = v.column6, latest_revision_id = v.column7, latest_state = 'pending', updated_at = ?
           FROM (VALUES ${existing.map(() => '(?, ?, ?, ?, ?, ?, ?)').join(', ')}) AS v WHERE sites.id = v.column1`,
        [atText, ...existing.flatMap((e) => [...row(e), e[1].latest!.revisionId])],
      ),
    );
  }
  if (events.length) {
    const log = audit.appendStatement(t, head, events);
    writes.push(sql.run(log.sql, log.params));
  }
  return { value: results, issued: Promise.all(writes) };
}
