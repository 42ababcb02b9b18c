import etag from 'etag';
import { LRUCache } from 'lru-cache';
import type { Database } from '../db.ts';
import { storedDateToIso } from '../lib/stored-date.ts';
import { Revision } from '../revisions/revision.model.ts';
import { REVISION_LIST_EXCLUDE, toRevision } from '../revisions/revision.view.ts';
import { notFound } from '../lib/app-error.ts';
import { User } from '../users/user.model.ts';
import { Site, type SiteStatus } from './site.model.ts';

export const SITE_SORTS = ['name', '-name', 'updated', '-updated', 'errors', '-errors'] as const;
export type SiteSort = (typeof SITE_SORTS)[number];
export const SITE_STATES = ['pending', 'approved', 'returned', 'never-approved'] as const satisfies readonly SiteStatus[];

export interface SiteQuery {
  page: number;
  limit: number;
  q?: string;
  state?: SiteStatus;
  sort: SiteSort;
}

/** Sort keys to columns; the id breaks ties so pages never overlap. */
const SORT_COLUMNS: Record<string, string> = { name: 's.name', updated: 's.updated_at', errors: 's.error_count' };

const revisionWithSummary = (as: string) => ({ model: Revision, as, attributes: { exclude: REVISION_LIST_EXCLUDE.filter((c) => c !== 'summary') }, include: [{ model: User, as: 'author' }] });

/** `SiteListItem` of the API contract. */
export const toSiteListItem = (s: Site) => ({
  id: s.id,
  name: s.name,
  status: s.status,
  approvedRevisionId: s.approvedRevisionId,
  latestRevision: s.latestRevision ? toRevision(s.latestRevision) : null,
  errorCount: s.errorCount,
  warningCount: s.warningCount,
  createdAt: s.createdAt.toISOString(),
  updatedAt: s.updatedAt.toISOString(),
  updatedBy: s.updatedBy ? { name: s.updatedBy.name, email: s.updatedBy.email } : null,
});

export interface ListAnswer {
  body: Buffer;
  etag: string;
}

/** Cached list answers, at most this many bytes of JSON in all. */
const LIST_CACHE_BYTES = 16 * 1024 * 1024;

export function createSitesService({ db }: { db: Database }) {
  // Answers of the list, each with the data_version it was read at: one is served again only
  // while nothing at all has been committed since, by this process or any other. Leads page
  // through the same few pages far more often than anyone writes.
  const answers = new LRUCache<string, ListAnswer & { version: number }>({ maxSize: LIST_CACHE_BYTES, sizeCalculation: (a) => a.body.length + 128 });

  /**
   * The list's answer as UTF-8 JSON with its ETag, from the cache when nothing has changed since
   * it was made (encoded and hashed once, not on every request). `dataVersion`: one the caller
   * read after the request came in (the sign-in check reads one).
   */
  async function listJson(query: SiteQuery, dataVersion?: number): Promise<ListAnswer> {
    const key = JSON.stringify([query.page, query.limit, query.q?.trim().toLowerCase() ?? '', query.state ?? '', query.sort]);
    // Read before the list, so a cached answer is never older than the version it is kept under.
    const version = dataVersion ?? (await db.dataVersion());
    const hit = answers.get(key);
    if (hit && hit.version === version) return hit;
    const body = Buffer.from(JSON.stringify(await list(query)), 'utf8');
    const answer = { version, body, etag: etag(body, { weak: true }) };
    answers.set(key, answer);
    return answer;
  }

  async function list(query: SiteQuery) {
    // One hand-written SELECT of the columns the answer needs, and a count of the sites table
    // alone: Sequelize's findAndCountAll joined every site to its revisions just to count them
    // (npm run bench, api). Values go in as bound parameters; the column comes from SORT_COLUMNS.
    // State filters as DEVELOPERS.md says: `never-approved` overlaps the others by design; the
    // search uses instr, not LIKE, so a `%` or `_` is just a character.
    const where: string[] = [];
    const params: (string | number)[] = [];
    if (query.state === 'never-approved') where.push('s.approved_revision_id IS NULL');
    else if (query.state) { where.push('s.latest_state = ?'); params.push(query.state); }
    const needle = query.q?.trim().toLowerCase();
    if (needle) { where.push('(instr(lower(s.name), ?) > 0 OR instr(s.id, ?) > 0)'); params.push(needle, needle); }
    const w = where.length ? `WHERE ${where.join(' AND ')}` : '';
    const column = SORT_COLUMNS[query.sort.replace(/^-/, '')];
    const dir = query.sort.startsWith('-') ? 'DESC' : 'ASC';
    const sql = `SELECT s.id, s.name, s.status, s.approved_revision_id AS approvedRevisionId, s.error_count AS errorCount, s.warning_count AS warningCount, s.created_at AS createdAt, s.updated_at AS updatedAt,
        r.id AS rId, r.site_id AS rSiteId, r.number AS rNumber, r.state AS rState, r.sha256 AS rSha, r.message AS rMessage, r.parent_id AS rParent, r.error_count AS rErr, r.warning_count AS rWarn, r.info_count AS rInfo, r.created_at AS rCreated, r.decided_at AS rDecided,
        a.id AS aId, a.name AS aName, a.email AS aEmail, u.id AS uId, u.name AS uName, u.email AS uEmail
      FROM sites s LEFT JOIN revisions r ON r.id = s.latest_revision_id LEFT JOIN users a ON a.id = r.author_id LEFT JOIN users u ON u.id = s.updated_by_id
      ${w} ORDER BY ${column} ${dir}, s.id ASC LIMIT ? OFFSET ?`;
    const read = db.sql();
    const [countRows, rows] = await Promise.all([
      read.all<{ n: number }>(`SELECT count(*) AS n FROM sites s ${w}`, params),
      read.all<Record<string, any>>(sql, [...params, query.limit, (query.page - 1) * query.limit]),
    ]);
    const iso = storedDateToIso;
    const items = rows.map((x) => ({
      id: x.id, name: x.name, status: x.status, approvedRevisionId: x.approvedRevisionId,
      latestRevision: x.rId == null ? null : { id: x.rId, siteId: x.rSiteId, number: x.rNumber, state: x.rState, sha256: x.rSha, message: x.rMessage, parentId: x.rParent, errorCount: x.rErr, warningCount: x.rWarn, infoCount: x.rInfo, author: x.aId == null ? null : { id: x.aId, name: x.aName, email: x.aEmail }, createdAt: iso(x.rCreated), decidedAt: iso(x.rDecided) },
      errorCount: x.errorCount, warningCount: x.warningCount, createdAt: iso(x.createdAt), updatedAt: iso(x.updatedAt),
      updatedBy: x.uId == null ? null : { name: x.uName, email: x.uEmail },
    }));
    return { items, total: countRows[0].n, page: query.page, limit: query.limit };
  }

  /** The site, its approved revision and its latest one, each with its summary figures. */
  async function get(id: string) {
    const site = await Site.findByPk(id, { include: [revisionWithSummary('latestRevision'), revisionWithSummary('approvedRevision'), { model: User, as: 'updatedBy' }] });
    if (!site) throw notFound('the site');
    const withSummary = (r: Revision | null | undefined) => (r ? { ...toRevision(r), summary: r.summary } : null);
    return { site: toSiteListItem(site), approved: withSummary(site.approvedRevision), latest: withSummary(site.latestRevision) };
  }

  return { list, listJson, get };
}

export type SitesService = ReturnType<typeof createSitesService>;
