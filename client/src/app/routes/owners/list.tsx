import { keepPreviousData, useQuery } from '@tanstack/react-query';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { ButtonLink } from '@/components/ui/button-link';
import { SearchBox } from '@/components/ui/data-table';
import { Loading } from '@/components/ui/notice';
import { PageHeader } from '@/components/ui/page';
import { customersQueryOptions } from '@/features/customers/api/get-customers';
import { CustomersTable } from '@/features/customers/components/customers-table';
import { readListParams, useListParams, type ListParams } from '@/lib/list-params';
import { can } from '@/lib/permissions';
import { queryClient } from '@/lib/query-client';
import { OFFICE, requireSession } from '../../guards';
import { useCurrentSession } from '../../use-current-session';

const DEFAULTS = { sort: 'name', dir: 'asc' as const };
const toQuery = (p: ListParams) => ({ q: p.q, sort: p.sort, dir: p.dir, page: p.page, pageSize: p.pageSize });

export async function loader({ request }: LoaderFunctionArgs) {
  await requireSession(request, OFFICE);
  await queryClient.ensureQueryData(customersQueryOptions(toQuery(readListParams(new URL(request.url).searchParams, DEFAULTS))));
  return null;
}

export function Component() {
  const session = useCurrentSession();
  const [params, update] = useListParams(DEFAULTS);
  const list = useQuery({ ...customersQueryOptions(toQuery(params)), placeholderData: keepPreviousData });
  return (
    <>
      <PageHeader
        title="Owners"
        lead="Private owners and flying groups whose aircraft we look after."
        actions={can.editRecords(session.user.role) ? <ButtonLink to="/owners/new">Add owner</ButtonLink> : null}
      />
      <div className="mb-4">
        <SearchBox label="Search name, e-mail or phone" value={params.q} onChange={(q) => update({ q })} />
      </div>
      {list.data ? <CustomersTable page={list.data} params={params} onChange={update} busy={list.isPlaceholderData} /> : <Loading />}
    </>
  );
}
