import { checkSite, diffSites, type Site as SiteDocument } from '../../shared/index.ts';
import type { AuditService } from '../audit/audit.service.ts';
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

    // Hand-written statements on the transaction's connection (db.sql): a push is the write the
    // fleet makes most, and Sequelize's query path cost more than the SQL (npm run bench, api).
    const stored = async () =>
      db.write(async (t) => {
        const sql = db.sql(t);
        const at = now();
        const atText = toStoredDate(at);
        const found = await sql.get<{ name: string; approvedRevisionId: number | null }>('SELECT name, approved_revision_id AS approvedRevisionId FROM sites WHERE id = ?', [siteId]);
        if (found) {
          const same = await sql.get<{ id: number }>('SELECT id FROM revisions WHERE site_id = ? AND sha256 = ?', [siteId, sha256]);
          if (same) return { id: same.id, created: false as const };
        } else {
          await sql.run(
            `INSERT INTO sites (id, name, status, latest_state, approved_revision_id, latest_revision_id, error_count, warning_count, updated_by_id, created_at, updated_at)
             VALUES (?, ?, 'pending', 'pending', NULL, NULL, 0, 0, ?, ?, ?)`,
            [siteId, doc.site.name, author.id, atText, atText],
          );
          await audit.append(t, { action: 'site.created', actor: actorOf(author), siteId, details: { name: doc.site.name } });
        }
        const approvedRevisionId = found?.approvedRevisionId ?? null;

        // The last number and the pending revisions in one statement; a new site has neither.
        let lastNumber = 0;
        let older: { id: number; number: number }[] = [];
        if (found) {
          const rows = await sql.all<{ lastNumber: number | null; id: number | null; number: number | null }>(
            `SELECT m.n AS lastNumber, r.id AS id, r.number AS number
               FROM (SELECT max(number) AS n FROM revisions WHERE site_id = ?) m
               LEFT JOIN revisions r ON r.site_id = ? AND r.state = 'pending'
              ORDER BY r.id`,
            [siteId, siteId],
          );
          lastNumber = rows[0]?.lastNumber ?? 0;
          older = rows.filter((x) => x.id !== null).map((x) => ({ id: x.id!, number: x.number! }));
        }
        const fields = {
          siteId,
          number: lastNumber + 1,
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
        const { lastId } = await sql.run(
          `INSERT INTO revisions (site_id, number, yaml, sha256, document, findings, summary, error_count, warning_count, info_count, author_id, message, parent_id, state, decided_at, decided_by_id, created_at)
           VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, 'pending', NULL, NULL, ?)`,
          [siteId, fields.number, text, sha256, documentJson, JSON.stringify(fields.findings), fields.summary === null ? null : JSON.stringify(fields.summary), fields.errorCount, fields.warningCount, fields.infoCount, author.id, message, approvedRevisionId, atText],
        );
        const revision = Revision.build({ id: lastId, ...fields }, { isNewRecord: false, raw: true });
        await audit.append(t, {
          action: 'revision.pushed',
          actor: actorOf(author),
          siteId,
          revisionId: revision.id,
          details: { number: revision.number, sha256, message, parentId: revision.parentId, errorCount: revision.errorCount, warningCount: revision.warningCount, infoCount: revision.infoCount },
        });
        // One revision awaits review per site: the newer push replaces the older.
        for (const old of older) {
          await sql.run(`UPDATE revisions SET state = 'superseded', decided_at = ? WHERE id = ?`, [atText, old.id]);
          await audit.append(t, { action: 'revision.superseded', actor: actorOf(author), siteId, revisionId: old.id, details: { number: old.number, supersededBy: revision.id } });
        }
        // The file names the site until a revision is approved; then the approved one does.
        const name = approvedRevisionId === null ? doc.site.name : found!.name;
        await sql.run(
          `UPDATE sites SET name = ?, latest_revision_id = ?, latest_state = 'pending', status = ?, error_count = ?, warning_count = ?, updated_by_id = ?, updated_at = ? WHERE id = ?`,
          [name, revision.id, deriveSiteStatus('pending', approvedRevisionId), revision.errorCount, revision.warningCount, author.id, atText, siteId],
        );
        // The approved revision the new one is compared with, read under the same lock.
        const base =
          approvedRevisionId === null
            ? null
            : await sql.get<{ id: number; number: number; document: string }>('SELECT id, number, document FROM revisions WHERE id = ?', [approvedRevisionId]);
        return {
          id: revision.id,
          created: true as const,
          revision,
          site: { name, approvedRevisionId },
          documentJson,
          base: base ? { id: base.id, number: base.number, document: JSON.parse(base.document) as SiteDocument } : null,
        };
      });

    let result: Awaited<ReturnType<typeof stored>>;
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
