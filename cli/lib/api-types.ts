// The API's answers, as DEVELOPERS.md's contract describes them (only what the CLI reads).
import type { Finding, SiteChange } from '../../shared/index.ts';

export interface PersonRef {
  id: number;
  name: string;
  email: string;
}

export interface User extends PersonRef {
  role: 'installer' | 'lead' | 'auditor' | 'admin';
}

export type RevisionState = 'pending' | 'approved' | 'returned' | 'superseded';

export interface Review {
  id: number;
  decision: 'approve' | 'return';
  comment: string | null;
  reviewer: PersonRef | null;
  createdAt: string;
}

export interface Revision {
  id: number;
  siteId: string;
  number: number;
  state: RevisionState;
  sha256: string;
  message: string | null;
  parentId: number | null;
  errorCount: number;
  warningCount: number;
  infoCount: number;
  author: PersonRef | null;
  createdAt: string;
  decidedAt?: string | null;
  /** On the single-revision route. */
  yaml?: string;
  findings?: Finding[];
  diff?: SiteChange[];
  reviews?: Review[];
}

export interface SiteListItem {
  id: string;
  name: string;
  status: 'pending' | 'approved' | 'returned' | 'never-approved';
  approvedRevisionId: number | null;
  latestRevision: Revision | null;
}

export interface SiteAnswer {
  site: SiteListItem;
  approved: Revision | null;
  latest: Revision | null;
}

export interface VerifyAnswer {
  ok: boolean;
  events: number;
  /** Hash of the last event checked: recorded by the auditor, it shows a later cut-off tail. */
  headHash?: string;
  firstBadEvent?: { seq: number; reason?: string; message?: string };
}
