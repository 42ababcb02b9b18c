// Shapes of the API answers (DEVELOPERS.md, "API contract"). The engine's own types come from
// shared/ as types only, so nothing of the engine is bundled by importing them.
import type { Finding, SiteChange, SiteSummary } from '../../../shared/index.ts';

export type Role = 'installer' | 'lead' | 'auditor' | 'admin';
export const ROLES: readonly Role[] = ['installer', 'lead', 'auditor', 'admin'];

export interface User {
  id: number | string;
  email: string;
  name: string;
  role: Role;
  disabled?: boolean;
  createdAt?: string;
}

export interface Person {
  id?: number | string;
  name: string;
  email: string;
}

export type RevisionState = 'pending' | 'approved' | 'returned' | 'superseded';
export type SiteStatus = 'pending' | 'approved' | 'returned' | 'never-approved';

export interface Review {
  id: number | string;
  decision: 'approve' | 'return';
  comment: string;
  reviewer: Person;
  createdAt: string;
}

export type ApprovalBlocker = 'not-a-lead' | 'own-revision' | 'has-errors' | 'not-pending' | 'stale-parent';

export interface Revision {
  id: number | string;
  siteId: string;
  number: number;
  state: RevisionState;
  sha256: string;
  message: string | null;
  parentId: number | string | null;
  errorCount: number;
  warningCount: number;
  infoCount: number;
  author: Person;
  createdAt: string;
  decidedAt?: string | null;
  reviews?: Review[];
}

export interface RevisionDetail extends Revision {
  yaml: string;
  findings: Finding[];
  summary: SiteSummary | null;
  diff: SiteChange[];
  /** The approved revision the diff was taken against; null: no base, everything is added. */
  diffBase?: { id: number | string; number: number } | null;
  reviews: Review[];
  approvalBlockers: ApprovalBlocker[];
}

export interface SiteListItem {
  id: string;
  name: string;
  status: SiteStatus;
  approvedRevisionId: number | string | null;
  latestRevision: Revision | null;
  errorCount: number;
  warningCount: number;
  updatedAt: string | null;
  updatedBy: Person | null;
}

export interface Page<T> {
  items: T[];
  total: number;
  page: number;
  limit: number;
}

export interface SiteDetail {
  site: SiteListItem;
  approved: Revision | null;
  latest: Revision | null;
}

export interface Attachment {
  id: number | string;
  siteId?: string;
  caption: string | null;
  filename?: string;
  originalName?: string;
  mediaType?: string;
  sha256?: string;
  size?: number;
  uploadedBy?: Person | null;
  createdAt?: string;
}

export interface AuditEvent {
  seq: number;
  at: string;
  action: string;
  siteId: string | null;
  revisionId: number | string | null;
  actor: { id: number | string | null; email: string | null; name?: string } | null;
  details: unknown;
  prevHash?: string;
  hash?: string;
}

/** The actions the server records (server/audit/audit.service.ts). */
export const AUDIT_ACTIONS: readonly string[] = [
  'revision.pushed', 'revision.approved', 'revision.returned', 'revision.superseded', 'site.created',
  'attachment.uploaded', 'user.created', 'user.updated', 'user.password-changed', 'auth.login', 'auth.login-failed',
];

export interface AuditVerify {
  ok: boolean;
  events: number;
  headHash?: string;
  firstBadEvent?: { seq: number; reason: string; message: string };
}

export interface OutboxMail {
  id: number | string;
  to: string;
  subject: string;
  date: string;
  text: string;
}
