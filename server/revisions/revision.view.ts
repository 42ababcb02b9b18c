import type { Finding, SiteChange, SiteSummary } from '../../shared/index.ts';
import { toPersonRef } from '../users/user.model.ts';
import type { Review } from './review.model.ts';
import type { Revision } from './revision.model.ts';

/** The heavy columns, left out of lists. */
export const REVISION_LIST_EXCLUDE = ['yaml', 'document', 'findings', 'summary'];

export type ApprovalBlocker = 'not-a-lead' | 'own-revision' | 'has-errors' | 'not-pending' | 'stale-parent';

export const toReview = (r: Review) => ({
  id: r.id,
  decision: r.decision,
  comment: r.comment,
  reviewer: toPersonRef(r.reviewer),
  createdAt: r.createdAt.toISOString(),
});

/** What `toRevision` reads: a model, or a row read by hand with its dates already in ISO 8601. */
export type RevisionFields = Pick<Revision, 'id' | 'siteId' | 'number' | 'state' | 'sha256' | 'message' | 'parentId' | 'errorCount' | 'warningCount' | 'infoCount'> & {
  author?: { id: number; name: string; email: string } | null;
  createdAt: Date | string;
  decidedAt: Date | string | null;
};

const iso = (d: Date | string) => (typeof d === 'string' ? d : d.toISOString());

/** `Revision` of the API contract (DEVELOPERS.md). */
export const toRevision = (r: RevisionFields) => ({
  id: r.id,
  siteId: r.siteId,
  number: r.number,
  state: r.state,
  sha256: r.sha256,
  message: r.message,
  parentId: r.parentId,
  errorCount: r.errorCount,
  warningCount: r.warningCount,
  infoCount: r.infoCount,
  author: toPersonRef(r.author),
  createdAt: iso(r.createdAt),
  decidedAt: r.decidedAt ? iso(r.decidedAt) : null,
});

export type RevisionView = ReturnType<typeof toRevision>;

export interface RevisionDetailView extends RevisionView {
  yaml: string;
  findings: Finding[];
  summary: SiteSummary | null;
  /** What changed against `diffBase`; everything is `added` when there is no base. */
  diff: SiteChange[];
  diffBase: { id: number; number: number } | null;
  reviews: ReturnType<typeof toReview>[];
  approvalBlockers: ApprovalBlocker[];
}
