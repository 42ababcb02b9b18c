import { Op, type Transaction, type WhereOptions } from 'sequelize';
import { canonicalJson } from '../lib/canonical-json.ts';
import { sha256Hex } from '../lib/hash.ts';
import type { Database } from '../db.ts';
import { AuditEvent } from './audit-event.model.ts';

export interface ChainHead {
  seq: number;
  hash: string;
}

/** The last event of the chain: its seq and hash. */
export const HEAD_SQL = 'SELECT seq, hash FROM audit_events ORDER BY seq DESC LIMIT 1';

/** The previous hash of the first event. */
export const GENESIS_HASH = '0'.repeat(64);

export type AuditAction =
  | 'auth.login'
  | 'auth.login-failed'
  | 'user.created'
  | 'user.updated'
  | 'user.password-changed'
  | 'site.created'
  | 'revision.pushed'
  | 'revision.superseded'
  | 'revision.approved'
  | 'revision.returned'
  | 'attachment.uploaded';

export interface Actor {
  id: number;
  email: string;
}

export interface AuditInput {
  action: AuditAction;
  actor: Actor | null;
  /** For a failed login: the e-mail address that was tried, when it names no account. */
  actorEmail?: string;
  siteId?: string | null;
  revisionId?: number | null;
  details?: Record<string, unknown>;
}

export interface AuditEventView {
  seq: number;
  at: string;
  actor: { id: number | null; email: string | null } | null;
  action: string;
  siteId: string | null;
  revisionId: number | null;
  details: unknown;
  prevHash: string;
  hash: string;
}

interface HashedFields {
  seq: number;
  at: string;
  actorId: number | null;
  actorEmail: string | null;
  action: string;
  siteId: string | null;
  revisionId: number | null;
  details: unknown;
}

/** hash = SHA-256(prevHash ‖ canonical JSON of the event's fields). */
export function eventHash(prevHash: string, fields: HashedFields): string {
  return sha256Hex(prevHash + canonicalJson(fields));
}

function parseDetails(text: string): { ok: true; value: unknown } | { ok: false } {
  try {
    return { ok: true, value: JSON.parse(text) };
  } catch {
    return { ok: false };
  }
}

export function toEventView(e: AuditEvent): AuditEventView {
  const details = parseDetails(e.details);
  return {
    seq: e.seq,
    at: e.at,
    actor: e.actorId === null && e.actorEmail === null ? null : { id: e.actorId, email: e.actorEmail },
    action: e.action,
    siteId: e.siteId,
    revisionId: e.revisionId,
    details: details.ok ? details.value : e.details,
    prevHash: e.prevHash,
    hash: e.hash,
  };
}

export interface AuditFilters {
  site?: string;
  actor?: string;
  action?: string;
  from?: string;
  to?: string;
}

export interface BadEvent {
  seq: number;
  reason: 'gap' | 'prev-hash-mismatch' | 'hash-mismatch' | 'unreadable';
  message: string;
}

export interface VerifyResult {
  ok: boolean;
  events: number;
  /** Hash of the last event: write it down to detect a later truncation of the log. */
  headHash: string;
  firstBadEvent?: BadEvent;
}

const VERIFY_BATCH = 500;

export function createAuditService({ db, now }: { db: Database; now: () => Date }) {
  // The chain's head as this transaction last wrote it: a second append in one transaction need
  // not read it again, since the write lock keeps every other writer out until the commit. Keyed
  // by the transaction object, so a rollback simply drops it with the transaction.
  const heads = new WeakMap<Transaction, ChainHead>();

  /**
   * The statement that appends `inputs` to the chain after `head`: the head this transaction
   * last wrote, or else `readHead` (the caller read it inside the same transaction, under the
   * write lock, so it stays the head). Remembered as the transaction's new head; the caller must
   * run the statement in `t`, or fail the transaction.
   */
  function appendStatement(t: Transaction, readHead: ChainHead | null, inputs: AuditInput[]): { sql: string; params: (string | number | null)[] } {
    let head = heads.get(t) ?? readHead;
    const params: (string | number | null)[] = [];
    for (const input of inputs) {
      const fields: HashedFields = {
        seq: (head?.seq ?? 0) + 1,
        at: now().toISOString(),
        actorId: input.actor?.id ?? null,
        actorEmail: input.actor?.email ?? input.actorEmail ?? null,
        action: input.action,
        siteId: input.siteId ?? null,
        revisionId: input.revisionId ?? null,
        details: input.details ?? {},
      };
      const prevHash = head?.hash ?? GENESIS_HASH;
      const hash = eventHash(prevHash, fields);
      params.push(fields.seq, fields.at, fields.actorId, fields.actorEmail, fields.action, fields.siteId, fields.revisionId, JSON.stringify(fields.details), prevHash, hash);
      head = { seq: fields.seq, hash };
    }
    if (head) heads.set(t, head);
    const row = '(?, ?, ?, ?, ?, ?, ?, ?, ?, ?)';
    return { sql: `INSERT INTO audit_events (seq, at, actor_id, actor_email, action, site_id, revision_id, details, prev_hash, hash) VALUES ${inputs.map(() => row).join(', ')}`, params };
  }

  /** Whether `t` has appended already (then `appendStatement` needs no head read). */
  const knowsHead = (t: Transaction) => heads.has(t);

  /**
   * Appends one event to the chain. Call it inside the write transaction of the change it
   * records: the transaction holds SQLite's write lock, so the head read here stays the head.
   */
  async function append(t: Transaction, input: AuditInput): Promise<void> {
    const sql = db.sql(t);
    const read = knowsHead(t) ? null : ((await sql.get<ChainHead>(HEAD_SQL)) ?? null);
    const statement = appendStatement(t, read, [input]);
    await sql.run(statement.sql, statement.params);
  }

  function where(f: AuditFilters): WhereOptions<AuditEvent> {
    const w: Record<string | symbol, unknown> = {};
    if (f.site) w.siteId = f.site;
    if (f.actor) {
      if (/^\d+$/.test(f.actor)) w.actorId = Number(f.actor);
      else w.actorEmail = f.actor.trim().toLowerCase();
    }
    if (f.action) {
      // `revision.*` selects every revision action.
      w.action = f.action.endsWith('.*') ? { [Op.startsWith]: f.action.slice(0, -1) } : f.action;
    }
    const at: Record<symbol, string> = {};
    if (f.from) at[Op.gte] = new Date(f.from).toISOString();
    if (f.to) at[Op.lte] = new Date(f.to).toISOString();
    if (f.from || f.to) w.at = at;
    return w as WhereOptions<AuditEvent>;
  }

  async function list(filters: AuditFilters, page: number, limit: number) {
    const { rows, count } = await AuditEvent.findAndCountAll({ where: where(filters), order: [['seq', 'DESC']], limit, offset: (page - 1) * limit });
    return { items: rows.map(toEventView), total: count, page, limit };
  }

  /** Every matching event in chain order, a batch at a time (for the CSV export). */
  async function* all(filters: AuditFilters): AsyncGenerator<AuditEventView> {
    let after = 0;
    for (;;) {
      const rows = await AuditEvent.findAll({ where: { ...where(filters), seq: { [Op.gt]: after } } as WhereOptions<AuditEvent>, order: [['seq', 'ASC']], limit: VERIFY_BATCH });
      for (const r of rows) yield toEventView(r);
      if (rows.length < VERIFY_BATCH) return;
      after = rows[rows.length - 1].seq;
    }
  }

  /**
   * Recomputes the chain in seq order. A changed event breaks its own hash; one rewritten with
   * a fresh hash breaks the next event's prevHash; a deleted one leaves a gap in seq; swapped
   * events break both.
   */
  async function verify(): Promise<VerifyResult> {
    const events = await AuditEvent.count();
    let expectedSeq = 1;
    let prevHash = GENESIS_HASH;
    let after: number | null = null;
    for (;;) {
      // No lower bound on the first batch: a row slipped in with seq 0 or below is judged too.
      const rows: AuditEvent[] = await AuditEvent.findAll({ where: after === null ? {} : { seq: { [Op.gt]: after } }, order: [['seq', 'ASC']], limit: VERIFY_BATCH });
      for (const r of rows) {
        const bad = (reason: BadEvent['reason'], message: string): VerifyResult => ({ ok: false, events, headHash: prevHash, firstBadEvent: { seq: r.seq, reason, message } });
        if (r.seq !== expectedSeq) {
          if (r.seq < expectedSeq) return bad('gap', `event ${r.seq} is out of sequence`);
          return bad('gap', `event ${expectedSeq}${r.seq - 1 > expectedSeq ? `–${r.seq - 1}` : ''} is missing before event ${r.seq}`);
        }
        if (r.prevHash !== prevHash) return bad('prev-hash-mismatch', `event ${r.seq} does not follow the hash of the event before it`);
        const details = parseDetails(r.details);
        if (!details.ok) return bad('unreadable', `event ${r.seq} has details that are not JSON`);
        const fields: HashedFields = { seq: r.seq, at: r.at, actorId: r.actorId, actorEmail: r.actorEmail, action: r.action, siteId: r.siteId, revisionId: r.revisionId, details: details.value };
        if (eventHash(prevHash, fields) !== r.hash) return bad('hash-mismatch', `event ${r.seq} was changed after it was written`);
        prevHash = r.hash;
        expectedSeq++;
      }
      if (rows.length < VERIFY_BATCH) return { ok: true, events, headHash: prevHash };
      after = rows[rows.length - 1].seq;
    }
  }

  return { append, appendStatement, list, all, verify };
}

export type AuditService = ReturnType<typeof createAuditService>;
