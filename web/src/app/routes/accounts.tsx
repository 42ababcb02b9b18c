import { InlineError, Loading } from '../../components/feedback.tsx';
import { PageHeader, Section } from '../../components/page-header.tsx';
import { RouteError } from '../../components/route-error.tsx';
import { queryClient } from '../../lib/query-client.ts';
import { CAN, useSession } from '../../lib/session.ts';
import { requireSession } from '../require-session.ts';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { usersQueryOptions, useUsers } from '../../features/users/api/get-users.ts';
import { CreateUserForm } from '../../features/users/components/create-user-form.tsx';
import { OutboxList } from '../../features/users/components/outbox-list.tsx';
import { UsersTable } from '../../features/users/components/users-table.tsx';

export async function loader({ request }: LoaderFunctionArgs) {
  const user = await requireSession({ request });
  if (!CAN.manageAccounts(user.role)) throw new Response('Accounts are managed by admins.', { status: 403 });
  await queryClient.ensureQueryData(usersQueryOptions());
  return null;
}

export function Component() {
  const session = useSession();
  const users = useUsers();
  return (
    <>
      <PageHeader title="Accounts" eyebrow="Admin" />
      <div className="flex flex-col gap-5">
        <Section title="New account" id="new-account"><CreateUserForm /></Section>
        <Section title="People" id="people">
          {users.isPending && <Loading />}
          {users.isError && <InlineError error={users.error} />}
          {users.data && <UsersTable users={users.data.items} selfId={session?.user.id} />}
        </Section>
        <Section title="Mail outbox (demo mode)" id="outbox"><OutboxList /></Section>
      </div>
    </>
  );
}

export const ErrorBoundary = RouteError;
