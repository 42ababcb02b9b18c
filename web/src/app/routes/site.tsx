import { Link, useParams, useSearchParams, type LoaderFunctionArgs } from 'react-router-dom';
import { StateBadge } from '../../components/badges.tsx';
import { buttonClass } from '../../components/button.tsx';
import { Notice } from '../../components/feedback.tsx';
import { PageHeader, Section } from '../../components/page-header.tsx';
import { RouteError } from '../../components/route-error.tsx';
import { SafetyCaution } from '../../components/safety-caution.tsx';
import { notFoundIf404 } from '../../lib/api-client.ts';
import { queryClient } from '../../lib/query-client.ts';
import { CAN, useSession } from '../../lib/session.ts';
import { requireSession } from '../require-session.ts';
import type { Revision, SiteDetail } from '../../types/api.ts';
import { revisionQueryOptions, useRevision } from '../../features/revisions/api/get-revision.ts';
import { siteQueryOptions, useSite } from '../../features/sites/api/get-site.ts';
import { siteRevisionsQueryOptions, useSiteRevisions } from '../../features/sites/api/get-site-revisions.ts';
import { AttachmentsPanel } from '../../features/sites/components/attachments-panel.tsx';
import { PhaseBalanceChart } from '../../features/sites/components/phase-balance-chart.tsx';
import { RevisionHistory } from '../../features/sites/components/revision-history.tsx';
import { DiagramFaultList, SiteDiagram } from '../../features/sites/components/site-diagram.tsx';
import { SummaryFigures } from '../../features/sites/components/summary-figures.tsx';
import { readSite } from '../../features/sites/lib/read-site.ts';

function shownRevision(detail: SiteDetail, view: string | null): Revision | null {
  if (view === 'latest') return detail.latest ?? detail.approved;
  return detail.approved ?? detail.latest;
}

export async function loader({ params, request }: LoaderFunctionArgs) {
  await requireSession({ request });
  const siteId = params.siteId!;
  const detail = await queryClient.ensureQueryData(siteQueryOptions(siteId)).catch(notFoundIf404);
  const shown = shownRevision(detail, new URL(request.url).searchParams.get('view'));
  await Promise.all([
    queryClient.ensureQueryData(siteRevisionsQueryOptions(siteId)),
    shown ? queryClient.ensureQueryData(revisionQueryOptions(shown.id)) : null,
  ]);
  return null;
}

function Configuration({ revisionId, title }: { revisionId: Revision['id']; title: string }) {
  const { data } = useRevision(revisionId);
  const revision = data.revision;
  const site = readSite(revision.yaml);
  return (
    <>
      <Section title="Summary figures" id="summary">
        {revision.summary ? <SummaryFigures summary={revision.summary} /> : <Notice>The server gave no summary for this revision.</Notice>}
      </Section>
      <Section title="Single-line diagram" id="diagram">
        {site ? (
          <>
            <div className="overflow-x-auto"><SiteDiagram site={site} findings={revision.findings ?? []} title={title} /></div>
            <DiagramFaultList site={site} findings={revision.findings ?? []} />
          </>
        ) : <Notice>The site file of this revision could not be read, so no diagram is drawn.</Notice>}
      </Section>
      <Section title="Phase balance" id="balance">
        {revision.summary ? <PhaseBalanceChart summary={revision.summary} /> : <Notice>No summary figures to chart.</Notice>}
      </Section>
    </>
  );
}

export function Component() {
  const { siteId } = useParams();
  const [search, setSearch] = useSearchParams();
  const session = useSession();
  const { data: detail } = useSite(siteId!);
  const { data: history } = useSiteRevisions(siteId!);
  const view = search.get('view');
  const shown = shownRevision(detail, view);
  const { approved, latest } = detail;
  const latestDiffers = latest && approved && String(latest.id) !== String(approved.id);

  return (
    <>
      <PageHeader title={detail.site.name} eyebrow={<>Site · <span className="font-mono normal-case tracking-normal">{detail.site.id}</span></>}>
        <StateBadge state={detail.site.status} />
        {latest?.state === 'pending' && (
          <Link to={`/revisions/${latest.id}`} className={buttonClass('primary')}>
            {CAN.review(session?.user.role) ? `Review revision ${latest.number}` : `Open revision ${latest.number}`}
          </Link>
        )}
      </PageHeader>

      <div className="flex flex-col gap-5">
        <SafetyCaution />

        <div className="flex flex-wrap items-center gap-3 text-body" aria-live="polite">
          {shown ? (
            <p>
              Showing <strong>revision {shown.number}</strong>
              {shown.state === 'approved' ? ', the approved configuration' : approved ? '' : ': no revision of this site has been approved yet'}
              {shown.state !== 'approved' && <> (<StateBadge state={shown.state} />)</>}.
            </p>
          ) : <p>This site has no revisions.</p>}
          {latestDiffers && (
            <button
              type="button"
              className={buttonClass('secondary')}
              onClick={() => setSearch(view === 'latest' ? {} : { view: 'latest' }, { replace: true })}
            >
              {view === 'latest' ? `Show the approved revision ${approved!.number}` : `Show the latest revision ${latest!.number}`}
            </button>
          )}
        </div>

        {shown && <Configuration revisionId={shown.id} title={detail.site.name} />}

        <div className="grid gap-5 lg:grid-cols-2">
          <Section title="History" id="history">
            <RevisionHistory revisions={history.items} approvedId={approved?.id ?? null} />
          </Section>
          <Section title="Attachments" id="attachments">
            <AttachmentsPanel siteId={detail.site.id} canUpload={CAN.upload(session?.user.role)} />
          </Section>
        </div>
      </div>
    </>
  );
}

export const ErrorBoundary = RouteError;
