import { checkSite, diffSites, type Site as SiteDocument } from '../../shared/index.ts';
import { HEAD_SQL, type AuditInput, type AuditService } from '../audit/audit.service.ts';
import { can } from '../auth/permissions.ts';
import { isUniqueViolation, type Database } from '../db.ts';
import { AppError, notFound } from '../lib/app-error.ts';
import { sha256Hex } from '../lib/hash.ts';
import { toStoredDate } from '../lib/stored-date.ts';
import { Site, deriveSiteStatus } from '../sites/site.model.ts';
import { User } from '../users/user.model.ts';
import { Review, type Decision } from './review.model.ts';
import { Revision } from './revision.model.ts';
import { REVISION_LIST_EXCLUDE, toReview, toRevision, type ApprovalBlocker, type RevisionDetailView, type RevisionView } from './revision.view.ts';

/** What a push just stored, for its notices (so they need not read it back). */
export interface PushedRevision {
  siteId: string;
  siteName: string;
  number: number;
  message: string | null;
  errorCount: number;
  warningCount: number;
  author: { id: number; name: string; email: string } | null;
}

export interface RevisionEvents {
  /** After the commit of a new revision. */
  pushed(revisionId: number, pushed?: PushedRevision): void;
  /** After the commit of a review. */
  decided(revisionId: number): void;
}

const actorOf = (u: User) => ({ id: u.id, email: u.email });

/** What a push stored, or the revision that already held the same text. */
type StoredPush =
  | { id: number; created: false }
  | {
      id: number;
      created: true;
      revision: Revision;
      site: { name: string; approvedRevisionId: number | null };
      documentJson: string;
      base: { id: number; number: number; document: SiteDocument } | null;
    };

interface PushRead {
  /** Null when the site is new. */
  siteName: string | null;
  approvedRevisionId: number | null;
  /** The revision of this site with the same text, if any. */
  sameId: number | null;
  lastNumber: number | null;
  /** `id:number` of each pending revision of the site, comma-separated. */
  pending: string | null;
  revisionSeq: number | null;
  maxRevisionId: number | null;
  headSeq: number | null;
  headHash: string | null;
  baseId: number | null;
  baseNumber: number | null;
  baseDocument: string | null;
}

/** Everything a push must know, read in one statement under the write lock (?1 site id, ?2 sha256). */
const PUSH_READ_SQL = `
  SELECT s.name AS siteName, s.approved_revision_id AS approvedRevisionId,
    (SELECT id FROM revisions WHERE site_id = ?1 AND sha256 = ?2) AS sameId,
    (SELECT max(number) FROM revisions WHERE site_id = ?1) AS lastNumber,
    (SELECT group_concat(id || ':' || number) FROM revisions WHERE site_id = ?1 AND state = 'pending') AS pending,
    (SELECT seq FROM sqlite_sequence WHERE name = 'revisions') AS revisionSeq,
    (SELECT max(id) FROM revisions) AS maxRevisionId,
    h.seq AS headSeq, h.hash AS headHash,
    b.id AS baseId, b.number AS baseNumber, b.document AS baseDocument
  FROM (SELECT 1)
  LEFT JOIN sites s ON s.id = ?1
  LEFT JOIN revisions b ON b.id = s.approved_revision_id
  LEFT JOIN (${HEAD_SQL}) h`;
const withAuthor = { model: User, as: 'author' };
const withReviews = { model: Review, as: 'reviews', include: [{ model: User, as: 'reviewer' }] };

export function createRevisionsService({ db, audit, now, events }: { db: Database; audit: AuditService; now: () => Date; events: RevisionEvents }) {
  /**
   * Checks the file with the engine (the client's findings are never trusted) and stores it as a
   * pending revision. The same text again answers the existing revision; a file that does not
   * parse or fails the schema is refused and nothing is stored.
   */
  async function push(text: string, message: string | null, author: User): Promise<{ revision: RevisionDetailView; created: boolean }> {
    const check = checkSite(text);
    if (!check.site) throw new AppError(422, 'invalid-site', 'the site file does not parse or does not match the schema', check.findings);
    const doc: SiteDocument = check.site;
    const siteId = doc.site.id;
    const sha256 = sha256Hex(text);

    // Hand-written statements on the transaction's connection (db.sql), one read for everything
    // the push must know and then every write issued at once, unawaited (db.writePipelined): a
    // push is the write the fleet makes most, and each statement awaited in turn cost a turn of
    // the busy event loop (npm run bench, api). The writes cannot fail on what was read: the
    // read saw every conflict first.
    const stored = async () =>
      db.writePipelined<StoredPush>(async (t) => {
        const sql = db.sql(t);
        const at = now();
        const atText = toStoredDate(at);
        const known = await sql.get<PushRead>(PUSH_READ_SQL, [siteId, sha256]);
        if (!known) throw new Error('the push read returned no row');
        if (known.sameId !== null) return { value: { id: known.sameId, created: false as const }, issued: Promise.resolve() };
        const isNew = known.siteName === null;
        const approvedRevisionId = known.approvedRevisionId;
        const older = (known.pending ?? '')
          .split(',')
          .filter(Boolean)
          .map((p) => p.split(':').map(Number))
          .map(([id, number]) => ({ id, number }))
          .sort((a, b) => a.id - b.id);
        // The id the row gets (AUTOINCREMENT: one past the highest ever given), named up front so
        // that the writes need not wait for the insert to learn it.
        const id = Math.max(known.revisionSeq ?? 0, known.maxRevisionId ?? 0) + 1;
        const fields = {
          id,
          siteId,
          number: (known.lastNumber ?? 0) + 1,
          yaml: text,
          sha256,
          document: doc,
          findings: check.findings,
          summary: check.summary ?? null,
          errorCount: check.counts.error,
          warningCount: check.counts.warning,
          infoCount: check.counts.info,
          authorId: author.id,
          message,
          parentId: approvedRevisionId,
          state: 'pending' as const,
          decidedAt: null,
          decidedById: null,
          createdAt: at,
        };
        const documentJson = JSON.stringify(doc);
        // The file names the site until a revision is approved; then the approved one does.
        const name = approvedRevisionId === null ? doc.site.name : known.siteName!;
        const events: AuditInput[] = [];
        const writes: Promise<unknown>[] = [];
        if (isNew) {
          writes.push(
            sql.run(
              `INSERT INTO sites (id, name, status, latest_state, approved_revision_id, latest_revision_id, error_count, warning_count, updated_by_id, created_at, updated_at)
               VALUES (?, ?, 'pending', 'pending', NULL, NULL, 0, 0, ?, ?, ?)`,
              [siteId, doc.site.name, author.id, atText, atText],
            ),
          );
          events.push({ action: 'site.created', actor: actorOf(author), siteId, details: { name: doc.site.name } });
        }
        writes.push(
          sql.run(
            `INSERT INTO revisions (id, site_id, number, yaml, sha256, document, findings, summary, error_count, warning_count, info_count, author_id, message, parent_id, state, decided_at, decided_by_id, created_at)
             VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, 'pending', NULL, NULL, ?)`,
            [id, siteId, fields.number, text, sha256, documentJson, JSON.stringify(fields.findings), fields.summary === null ? null : JSON.stringify(fields.summary), fields.errorCount, fields.warningCount, fields.infoCount, author.id, message, approvedRevisionId, atText],
          ),
        );
        events.push({
          action: 'revision.pushed',
          actor: actorOf(author),
          siteId,
          revisionId: id,
          details: { number: fields.number, sha256, message, parentId: approvedRevisionId, errorCount: fields.errorCount, warningCount: fields.warningCount, infoCount: fields.infoCount },
        });
        // One revision awaits review per site: the newer push replaces the older.
        for (const old of older) {
          writes.push(sql.run(`UPDATE revisions SET state = 'superseded', decided_at = ? WHERE id = ?`, [atText, old.id]));
          events.push({ action: 'revision.superseded', actor: actorOf(author), siteId, revisionId: old.id, details: { number: old.number, supersededBy: id } });
        }
        writes.push(
          sql.run(
            `UPDATE sites SET name = ?, latest_revision_id = ?, latest_state = 'pending', status = ?, error_count = ?, warning_count = ?, updated_by_id = ?, updated_at = ? WHERE id = ?`,
            [name, id, deriveSiteStatus('pending', approvedRevisionId), fields.errorCount, fields.warningCount, author.id, atText, siteId],
          ),
        );
        const head = known.headSeq === null ? null : { seq: known.headSeq, hash: known.headHash! };
        const log = audit.appendStatement(t, head, events);
        writes.push(sql.run(log.sql, log.params));
        const revision = Revision.build(fields, { isNewRecord: false, raw: true });
        return {
          value: {
            id,
            created: true as const,
            revision,
            site: { name, approvedRevisionId },
            documentJson,
            // The approved revision the new one is compared with, read under the same lock.
            base: known.baseId === null ? null : { id: known.baseId, number: known.baseNumber!, document: JSON.parse(known.baseDocument!) as SiteDocument },
          },
          // Awaited by the writer before the COMMIT: the group's next write need not wait.
          issued: Promise.all(writes),
        };
      });

    let result: StoredPush;
    try {
      result = await stored();
    } catch (err) {
      // Another process stored the same text between our check and our insert.
      if (!isUniqueViolation(err)) throw err;
      const same = await Revision.findOne({ where: { siteId, sha256 }, attributes: ['id'] });
      if (!same) throw err;
      result = { id: same.id, created: false };
    }
    if (!result.created) return { revision: await detail(result.id, author), created: false };
    const { revision, site, base, documentJson } = result;
    events.pushed(revision.id, { siteId, siteName: site.name, number: revision.number, message, errorCount: revision.errorCount, warningCount: revision.warningCount, author: { id: author.id, name: author.name, email: author.email } });
    // The answer `detail` would read back, built from what was just stored: a new revision has no
    // reviews yet, and is compared with the site's approved revision (its parent).
    revision.author = author;
    return {
      revision: {
        ...toRevision(revision),
        yaml: text,
        findings: check.findings,
        summary: check.summary ?? null,
        // As stored: the JSON round trip drops what the column would not keep.
        diff: diffSites(base?.document ?? null, JSON.parse(documentJson) as SiteDocument),
        diffBase: base ? { id: base.id, number: base.number } : null,
        reviews: [],
        approvalBlockers: blockers(revision, site, author),
      },
      created: true,
    };
  }

  function blockers(r: Revision, site: Pick<Site, 'approvedRevisionId'>, caller: User): ApprovalBlocker[] {
    const out: ApprovalBlocker[] = [];
    if (!can(caller.role, 'revisions:review')) out.push('not-a-lead');
    if (r.authorId === caller.id) out.push('own-revision');
    if (r.errorCount > 0) out.push('has-errors');
    if (r.state !== 'pending') out.push('not-pending');
    else if (r.parentId !== site.approvedRevisionId) out.push('stale-parent');
    return out;
  }

  /** One revision with its text, findings, figures, reviews and the change against the approved one. */
  async function detail(id: number, caller: User): Promise<RevisionDetailView> {
    const r = await Revision.findByPk(id, { include: [withAuthor, withReviews], order: [[{ model: Review, as: 'reviews' }, 'id', 'ASC']] });
    if (!r) throw notFound('the revision');
    const site = await Site.findByPk(r.siteId);
    if (!site) throw notFound('the site');
    // Against the site's approved revision; the approved one itself against the one it replaced.
    const baseId = site.approvedRevisionId !== null && site.approvedRevisionId !== r.id ? site.approvedRevisionId : r.parentId;
    const base = baseId === null ? null : await Revision.findByPk(baseId, { attributes: ['id', 'number', 'document'] });
    return {
      ...toRevision(r),
      yaml: r.yaml,
      findings: r.findings,
      summary: r.summary,
      diff: diffSites(base?.document ?? null, r.document),
      diffBase: base ? { id: base.id, number: base.number } : null,
      reviews: (r.reviews ?? []).map(toReview),
      approvalBlockers: blockers(r, site, caller),
    };
  }

  /** A site's revisions, newest first, each with its reviews. */
  async function listForSite(siteId: string): Promise<(RevisionView & { reviews: ReturnType<typeof toReview>[] })[]> {
    if (!(await Site.findByPk(siteId, { attributes: ['id'] }))) throw notFound('the site');
    const rows = await Revision.findAll({
      where: { siteId },
      attributes: { exclude: REVISION_LIST_EXCLUDE },
      include: [withAuthor, withReviews],
      order: [
        ['number', 'DESC'],
        [{ model: Review, as: 'reviews' }, 'id', 'ASC'],
      ],
    });
    return rows.map((r) => ({ ...toRevision(r), reviews: (r.reviews ?? []).map(toReview) }));
  }

  /**
   * Approve or return a pending revision. The checks run inside the write transaction, so of two
   * reviews racing for one revision the second sees the first's outcome (409 not-pending).
   */
  async function review(id: number, decision: Decision, commentInput: string | undefined, reviewer: User) {
    const comment = commentInput?.trim() || null;
    const reviewId = await db.write(async (t) => {
      const r = await Revision.findByPk(id, { transaction: t });
      if (!r) throw notFound('the revision');
      if (r.authorId === reviewer.id) throw new AppError(403, 'own-revision', 'four eyes: another lead must review a revision you pushed');
      if (r.state !== 'pending') throw new AppError(409, 'not-pending', `revision ${r.number} is ${r.state}, not pending`);
      if (decision === 'return' && !comment) throw new AppError(422, 'comment-required', 'say why the revision goes back: a return needs a comment');
      const site = await Site.findByPk(r.siteId, { transaction: t });
      if (!site) throw notFound('the site');
      if (decision === 'approve') {
        if (r.errorCount > 0) throw new AppError(409, 'has-errors', `revision ${r.number} has ${r.errorCount} error finding(s): it cannot be approved`, r.findings.filter((f) => f.severity === 'error'));
        if (r.parentId !== site.approvedRevisionId) throw new AppError(409, 'stale-parent', `revision ${r.number} was based on a revision that is no longer the approved one: push it again on top of the current one`);
      }
      const at = now();
      const previousApprovedId = site.approvedRevisionId;
      const state = decision === 'approve' ? 'approved' : 'returned';
      await r.update({ state, decidedAt: at, decidedById: reviewer.id }, { transaction: t });
      const created = await Review.create({ revisionId: r.id, reviewerId: reviewer.id, decision, comment, createdAt: at }, { transaction: t });
      const approvedRevisionId = decision === 'approve' ? r.id : site.approvedRevisionId;
      const latest = site.latestRevisionId === r.id;
      await site.update(
        {
          approvedRevisionId,
          name: decision === 'approve' ? (r.document as SiteDocument).site.name : site.name,
          ...(latest ? { latestState: state, status: deriveSiteStatus(state, approvedRevisionId) } : {}),
          updatedById: reviewer.id,
          updatedAt: at,
        },
        { transaction: t },
      );
      await audit.append(t, {
        action: decision === 'approve' ? 'revision.approved' : 'revision.returned',
        actor: actorOf(reviewer),
        siteId: r.siteId,
        revisionId: r.id,
        details: { number: r.number, comment, previousApprovedId },
      });
      return created.id;
    });
    events.decided(id);
    const review = await Review.findByPk(reviewId, { include: [{ model: User, as: 'reviewer' }] });
    return { revision: await detail(id, reviewer), review: toReview(review!) };
  }

  return { push, detail, listForSite, review };
}

export type RevisionsService = ReturnType<typeof createRevisionsService>;
