import { Op, col, fn, where as sqlWhere, type Order, type WhereOptions } from 'sequelize';
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

const SORT_COLUMNS: Record<string, string> = { name: 'name', updated: 'updatedAt', errors: 'errorCount' };

function order(sort: SiteSort): Order {
  const dir = sort.startsWith('-') ? 'DESC' : 'ASC';
  const column = SORT_COLUMNS[sort.replace(/^-/, '')];
  return [[column, dir], ['id', 'ASC']];
}

/** The state filters of DEVELOPERS.md: `never-approved` overlaps the others by design. */
function stateWhere(state: SiteStatus | undefined): WhereOptions<Site> {
  if (!state) return {};
  if (state === 'never-approved') return { approvedRevisionId: null };
  return { latestState: state };
}

function searchWhere(q: string | undefined): WhereOptions<Site> {
  const needle = q?.trim().toLowerCase();
  if (!needle) return {};
  // instr, not LIKE: a `%` or `_` in the search is just a character.
  return { [Op.or]: [sqlWhere(fn('instr', fn('lower', col('Site.name')), needle), Op.gt, 0), sqlWhere(fn('instr', col('Site.id'), needle), Op.gt, 0)] };
}

const lightRevision = (as: string) => ({ model: Revision, as, attributes: { exclude: REVISION_LIST_EXCLUDE }, include: [{ model: User, as: 'author' }] });
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

export function createSitesService() {
  async function list(query: SiteQuery) {
    const { rows, count } = await Site.findAndCountAll({
      where: { [Op.and]: [stateWhere(query.state), searchWhere(query.q)] },
      include: [lightRevision('latestRevision'), { model: User, as: 'updatedBy' }],
      order: order(query.sort),
      limit: query.limit,
      offset: (query.page - 1) * query.limit,
      distinct: true,
    });
    return { items: rows.map(toSiteListItem), total: count, page: query.page, limit: query.limit };
  }

  /** The site, its approved revision and its latest one, each with its summary figures. */
  async function get(id: string) {
    const site = await Site.findByPk(id, { include: [revisionWithSummary('latestRevision'), revisionWithSummary('approvedRevision'), { model: User, as: 'updatedBy' }] });
    if (!site) throw notFound('the site');
    const withSummary = (r: Revision | null | undefined) => (r ? { ...toRevision(r), summary: r.summary } : null);
    return { site: toSiteListItem(site), approved: withSummary(site.approvedRevision), latest: withSummary(site.latestRevision) };
  }

  return { list, get };
}

export type SitesService = ReturnType<typeof createSitesService>;
