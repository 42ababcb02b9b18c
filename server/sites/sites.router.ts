import type { JSONSchemaType } from 'ajv';
import { Router } from 'express';
import type { MountRoute } from '../lib/route.ts';
import { queryChecker, siteParam } from '../lib/validate.ts';
import type { RevisionsService } from '../revisions/revisions.service.ts';
import type { SiteStatus } from './site.model.ts';
import { SITE_SORTS, SITE_STATES, type SiteQuery, type SitesService, type SiteSort } from './sites.service.ts';

interface ListQuery extends SiteQuery {
  /** Alias of `state`: the field in the answer is called `status`. */
  status?: SiteStatus;
}

const listQuery: JSONSchemaType<ListQuery> = {
  type: 'object',
  properties: {
    page: { type: 'integer', minimum: 1, maximum: 1_000_000, default: 1 },
    limit: { type: 'integer', minimum: 1, maximum: 100, default: 20 },
    q: { type: 'string', maxLength: 200, nullable: true },
    state: { type: 'string', enum: [...SITE_STATES], nullable: true },
    status: { type: 'string', enum: [...SITE_STATES], nullable: true },
    sort: { type: 'string', enum: [...SITE_SORTS] as SiteSort[], default: '-updated' },
  },
  required: [],
  additionalProperties: true,
};
const checkListQuery = queryChecker(listQuery);

export function sitesRouter(mount: MountRoute, sites: SitesService, revisions: RevisionsService) {
  const router = Router();

  mount(router, 'sites.list', async (req, res) => {
    const query = checkListQuery(req.query);
    const { body, etag } = await sites.listJson({ ...query, state: query.state ?? query.status }, req.dataVersion);
    // With the ETag set, Express neither hashes the body again nor sends it to a client that has
    // it already (304 on a matching If-None-Match). The browser keeps it for this user only and
    // asks again every time.
    res.type('application/json').set({ ETag: etag, 'Cache-Control': 'private, no-cache' }).send(body);
  });

  mount(router, 'sites.get', async (req, res) => {
    res.json(await sites.get(siteParam(req.params.id)));
  });

  mount(router, 'sites.revisions', async (req, res) => {
    res.json({ items: await revisions.listForSite(siteParam(req.params.id)) });
  });

  return router;
}
