import { keepPreviousData, useQuery } from '@tanstack/react-query';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { SearchBox } from '@/components/ui/data-table';
import { Loading } from '@/components/ui/notice';
import { Card, PageHeader } from '@/components/ui/page';
import { usersQueryOptions } from '@/features/users/api/get-users';
import { InviteStaffForm } from '@/features/users/components/invite-staff-form';
import { StaffTable } from '@/features/users/components/staff-table';
import { readListParams, useListParams, type ListParams } from '@/lib/list-params';
import { queryClient } from '@/lib/query-client';
import { ADMIN, requireSession } from '../guards';
import { useCurrentSession } from '../use-current-session';

const DEFAULTS = { sort: 'name', dir: 'asc' as const };
const toQuery = (p: ListParams) => ({ q: p.q, sort: p.sort, dir: p.dir, page: p.page, pageSize: p.pageSize });

export async function loader({ request }: LoaderFunctionArgs) {
  await requireSession(request, ADMIN);
  await queryClient.ensureQueryData(usersQueryOptions(toQuery(readListParams(new URL(request.url).searchParams, DEFAULTS))));
  return null;
}

export function Component() {
  const session = useCurrentSession();
  const [params, update] = useListParams(DEFAULTS);
  const list = useQuery({ ...usersQueryOptions(toQuery(params)), placeholderData: keepPreviousData });
  return (
    <>
      <PageHeader title="Staff" lead="Everyone who signs in to this workshop, and the role each one has." />
      <div className="flex flex-col gap-5">
        <Card title="Invite a member of staff">
          <InviteStaffForm />
        </Card>
        <Card title="Sign-ins">
          <div className="mb-4">
            <SearchBox label="Search name or e-mail" value={params.q} onChange={(q) => update({ q })} />
          </div>
          {list.data ? <StaffTable page={list.data} params={params} onChange={update} selfId={session.user.id} busy={list.isPlaceholderData} /> : <Loading />}
        </Card>
      </div>
    </>
  );
}
