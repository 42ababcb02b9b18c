import { checkSite, diffSites, type Finding, type Site as SiteDocument, type SiteSummary } from '../../shared/index.ts';
import type { AuditService } from '../audit/audit.service.ts';
import { can } from '../auth/permissions.ts';
import type { Database } from '../db.ts';
import { AppError, notFound } from '../lib/app-error.ts';
import { sha256Hex } from '../lib/hash.ts';
import { storedDateToIso } from '../lib/stored-date.ts';
import { Site, deriveSiteStatus } from '../sites/site.model.ts';
import { User } from '../users/user.model.ts';
import { Review, type Decision } from './review.model.ts';
import { PUSH_BATCH_MAX, storeBatch, type PushInput, type StoredPush } from './push-batch.ts';
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
  pushed(revisionId: number, pushed: PushedRevision): void;
  /** After the commit of a review. */
  decided(revisionId: number): void;
}

const actorOf = (u: User) => ({ id: u.id, email: u.email });

interface DetailRow {
  id: number;
  siteId: string;
  number: number;
  state: Revision['state'];
  sha256: string;
  message: string | null;
  parentId: number | null;
  errorCount: number;
  warningCount: number;
  infoCount: number;
  authorId: number;
  yaml: string;
  document: string;
  findings: string;
  summary: string | null;
  createdAt: string;
  decidedAt: string | null;
  aId: number | null;
  aName: string | null;
  aEmail: string | null;
  /** Null when the site row is missing (never, short of a hand on the file). */
  siteRowId: string | null;
  siteApprovedId: number | null;
  baseId: number | null;
  baseNumber: number | null;
  baseDocument: string | null;
}

/**
 * One revision, its author, its site's approved revision and the revision it is compared with:
 * the site's approved one, or for the approved one itself the one it replaced (its parent).
 */
const DETAIL_SQL = `
  SELECT r.id, r.site_id AS siteId, r.number, r.state, r.sha256, r.message, r.parent_id AS parentId, r.error_count AS errorCount,
    r.warning_count AS warningCount, r.info_count AS infoCount, r.author_id AS authorId, r.yaml, r.document, r.findings, r.summary,
    r.created_at AS createdAt, r.decided_at AS decidedAt, a.id AS aId, a.name AS aName, a.email AS aEmail,
    s.id AS siteRowId, s.approved_revision_id AS siteApprovedId, b.id AS baseId, b.number AS baseNumber, b.document AS baseDocument
  FROM revisions r
  LEFT JOIN users a ON a.id = r.author_id
  LEFT JOIN sites s ON s.id = r.site_id
  LEFT JOIN revisions b ON b.id = CASE WHEN s.approved_revision_id IS NOT NULL AND s.approved_revision_id != r.id THEN s.approved_revision_id ELSE r.parent_id END
  WHERE r.id = ?`;

interface ReviewRow {
  id: number;
  decision: Decision;
  comment: string | null;
  createdAt: string;
  uId: number | null;
  uName: string | null;
  uEmail: string | null;
}

const REVIEWS_SQL = `
  SELECT v.id, v.decision, v.comment, v.created_at AS createdAt, u.id AS uId, u.name AS uName, u.email AS uEmail
  FROM reviews v LEFT JOIN users u ON u.id = v.reviewer_id WHERE v.revision_id = ? ORDER BY v.id`;

const withAuthor = { model: User, as: 'author' };
const withReviews = { model: Review, as: 'reviews', include: [{ model: User, as: 'reviewer' }] };

export function createRevisionsService({ db, audit, now, events }: { db: Database; audit: AuditService; now: () => Date; events: RevisionEvents }) {
  // Pushes that arrive while the writer is busy wait together in one batch and are stored by
  // one write (push-batch.ts): under load, a handful of statements per batch instead of a
  // dozen per push (npm run bench, api). A push joins the batch until the writer takes it up.
  let waiting: { batch: PushInput[]; stored: Promise<StoredPush[]> } | null = null;

  async function store(input: PushInput): Promise<StoredPush> {
    if (!waiting || waiting.batch.length >= PUSH_BATCH_MAX) {
      const batch: PushInput[] = [];
      const mine = {
        batch,
        stored: db.writePipelined((t) => {
          // Taken up: later pushes start a batch of their own.
          if (waiting === mine) waiting = null;
          return storeBatch(db, audit, t, now(), batch);
        }),
      };
      waiting = mine;
    }
    const { batch, stored } = waiting;
    const index = batch.push(input) - 1;
    return (await stored)[index];
  }

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

    const result = await store({ text, message, author, doc, check, sha256: sha256Hex(text) });
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

  function blockers(r: Pick<Revision, 'authorId' | 'errorCount' | 'state' | 'parentId'>, site: Pick<Site, 'approvedRevisionId'>, caller: User): ApprovalBlocker[] {
    const out: ApprovalBlocker[] = [];
    if (!can(caller.role, 'revisions:review')) out.push('not-a-lead');
    if (r.authorId === caller.id) out.push('own-revision');
    if (r.errorCount > 0) out.push('has-errors');
    if (r.state !== 'pending') out.push('not-pending');
    else if (r.parentId !== site.approvedRevisionId) out.push('stale-parent');
    return out;
  }

  /**
   * One revision with its text, findings, figures, reviews and the change against the approved
   * one: the page a lead opens most, so two hand-written reads at once (db.sql) instead of three
   * model reads one after the other (npm run bench, api).
   */
  async function detail(id: number, caller: User): Promise<RevisionDetailView> {
    const read = db.sql();
    const [r, reviewRows] = await Promise.all([read.get<DetailRow>(DETAIL_SQL, [id]), read.all<ReviewRow>(REVIEWS_SQL, [id])]);
    if (!r) throw notFound('the revision');
    if (r.siteRowId === null) throw notFound('the site');
    const view = toRevision({ ...r, author: r.aId === null ? null : { id: r.aId, name: r.aName!, email: r.aEmail! }, createdAt: storedDateToIso(r.createdAt)!, decidedAt: storedDateToIso(r.decidedAt) });
    return {
      ...view,
      yaml: r.yaml,
      findings: JSON.parse(r.findings) as Finding[],
      summary: r.summary === null ? null : (JSON.parse(r.summary) as SiteSummary),
      // Against the site's approved revision; the approved one itself against the one it replaced.
      diff: diffSites(r.baseDocument === null ? null : (JSON.parse(r.baseDocument) as SiteDocument), JSON.parse(r.document) as SiteDocument),
      diffBase: r.baseId === null ? null : { id: r.baseId, number: r.baseNumber! },
      reviews: reviewRows.map((v) => ({ id: v.id, decision: v.decision, comment: v.comment, reviewer: v.uId === null ? null : { id: v.uId, name: v.uName!, email: v.uEmail! }, createdAt: storedDateToIso(v.createdAt)! })),
      approvalBlockers: blockers({ authorId: r.authorId, errorCount: r.errorCount, state: r.state, parentId: r.parentId }, { approvedRevisionId: r.siteApprovedId }, caller),
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
