import { useState } from 'react';
import { Link, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { Notice } from '../../components/feedback.tsx';
import { PageHeader, Section } from '../../components/page-header.tsx';
import { RouteError } from '../../components/route-error.tsx';
import { SafetyCaution } from '../../components/safety-caution.tsx';
import { notFoundIf404 } from '../../lib/api-client.ts';
import { formatDateTime } from '../../lib/format.ts';
import { queryClient } from '../../lib/query-client.ts';
import { CAN, useSession } from '../../lib/session.ts';
import { requireSession } from '../require-session.ts';
import { revisionQueryOptions, useRevision } from '../../features/revisions/api/get-revision.ts';
import { DiffTable } from '../../features/revisions/components/diff-table.tsx';
import { FindingsList } from '../../features/revisions/components/findings-list.tsx';
import { ReviewForm } from '../../features/revisions/components/review-form.tsx';
import { RevisionMeta } from '../../features/revisions/components/revision-meta.tsx';
import { YamlView } from '../../features/revisions/components/yaml-view.tsx';
import { siteQueryOptions } from '../../features/sites/api/get-site.ts';
import { siteRevisionsQueryOptions } from '../../features/sites/api/get-site-revisions.ts';
import { DiagramFaultList, SiteDiagram } from '../../features/sites/components/site-diagram.tsx';
import { readSite } from '../../features/sites/lib/read-site.ts';
import { useQuery } from '@tanstack/react-query';

export async function loader({ params, request }: LoaderFunctionArgs) {
  await requireSession({ request });
  const { revision } = await queryClient.ensureQueryData(revisionQueryOptions(params.revisionId!)).catch(notFoundIf404);
  await Promise.all([
    queryClient.ensureQueryData(siteQueryOptions(revision.siteId)),
    queryClient.ensureQueryData(siteRevisionsQueryOptions(revision.siteId)),
  ]);
  return null;
}

export function Component() {
  const { revisionId } = useParams();
  const session = useSession();
  const { data } = useRevision(revisionId!);
  const revision = data.revision;
  const site = useQuery(siteQueryOptions(revision.siteId));
  const history = useQuery(siteRevisionsQueryOptions(revision.siteId));
  const [selectedLine, setSelectedLine] = useState<number | null>(null);
  const siteName = site.data?.site.name ?? revision.siteId;
  const parent = history.data?.items.find((r) => String(r.id) === String(revision.parentId));
  const base = revision.diffBase ?? (parent ? { id: parent.id, number: parent.number } : null);
  const against = base ? `approved revision ${base.number}` : 'an empty file (no approved revision before it)';
  const parsed = readSite(revision.yaml);
  const role = session?.user.role;

  return (
    <>
      <PageHeader
        title={`Revision ${revision.number}`}
        eyebrow={<>Review · <Link to={`/sites/${encodeURIComponent(revision.siteId)}`} className="normal-case tracking-normal text-weir-700 underline underline-offset-2">{siteName}</Link></>}
      />
      <div className="flex flex-col gap-5">
        <RevisionMeta revision={revision} />
        <SafetyCaution compact />

        <div className="grid gap-5 xl:grid-cols-[minmax(0,1fr)_minmax(0,1fr)]">
          <div className="flex min-w-0 flex-col gap-5">
            <Section title="Findings" id="findings">
              <FindingsList findings={revision.findings ?? []} onSelectLine={setSelectedLine} selectedLine={selectedLine} />
            </Section>
            <Section title="Changes" id="changes">
              <DiffTable changes={revision.diff ?? []} against={against} collapse={!base} />
            </Section>
            <Section title="Decision" id="decision">
              {CAN.review(role) ? (
                <ReviewForm revision={revision} />
              ) : (
                <Notice>Only lead engineers approve or return revisions. You can read the findings, the changes and the site file.</Notice>
              )}
              {(revision.reviews ?? []).length > 0 && (
                <div className="mt-4">
                  <h3 className="mb-1 text-body font-semibold">Reviews of this revision</h3>
                  <ul className="flex flex-col gap-1.5">
                    {revision.reviews.map((r) => (
                      <li key={r.id} className="rounded-md bg-ink-50 px-3 py-2">
                        <span className={`font-semibold ${r.decision === 'approve' ? 'text-weir-800' : 'text-sev-warning'}`}>{r.decision === 'approve' ? '✓ Approved' : '↩ Returned'}</span>{' '}
                        <span className="text-caption text-ink-700">by {r.reviewer?.name} · {formatDateTime(r.createdAt)}</span>
                        {r.comment && <p className="whitespace-pre-line break-words">{r.comment}</p>}
                      </li>
                    ))}
                  </ul>
                </div>
              )}
            </Section>
          </div>
          <div className="min-w-0">
            <Section title="Site file" id="yaml" className="xl:sticky xl:top-4">
              <YamlView text={revision.yaml ?? ''} findings={revision.findings ?? []} selectedLine={selectedLine} />
            </Section>
          </div>
        </div>

        {parsed && (
          <Section title="Diagram of this revision" id="diagram">
            <div className="overflow-x-auto"><SiteDiagram site={parsed} findings={revision.findings ?? []} title={`${siteName}, revision ${revision.number}`} /></div>
            <DiagramFaultList site={parsed} findings={revision.findings ?? []} />
          </Section>
        )}
      </div>
    </>
  );
}

export const ErrorBoundary = RouteError;
