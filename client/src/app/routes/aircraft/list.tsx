import { keepPreviousData, useQuery } from '@tanstack/react-query';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { ButtonLink } from '@/components/ui/button-link';
import { SearchBox } from '@/components/ui/data-table';
import { Loading } from '@/components/ui/notice';
import { PageHeader } from '@/components/ui/page';
import { aircraftListQueryOptions } from '@/features/aircraft/api/get-aircraft-list';
import { AircraftTable } from '@/features/aircraft/components/aircraft-table';
import { readListParams, useListParams, type ListParams } from '@/lib/list-params';
import { can } from '@/lib/permissions';
import { queryClient } from '@/lib/query-client';
import { OFFICE, requireSession } from '../../guards';
import { useCurrentSession } from '../../use-current-session';

const DEFAULTS = { sort: 'registration', dir: 'asc' as const };
const toQuery = (p: ListParams) => ({ q: p.q, sort: p.sort, dir: p.dir, page: p.page, pageSize: p.pageSize });

export async function loader({ request }: LoaderFunctionArgs) {
  await requireSession(request, OFFICE);
  await queryClient.ensureQueryData(aircraftListQueryOptions(toQuery(readListParams(new URL(request.url).searchParams, DEFAULTS))));
  return null;
}

export function Component() {
  const session = useCurrentSession();
  const [params, update] = useListParams(DEFAULTS);
  const list = useQuery({ ...aircraftListQueryOptions(toQuery(params)), placeholderData: keepPreviousData });
  return (
    <>
      <PageHeader
        title="Aircraft"
        lead="The aircraft this workshop looks after."
        actions={can.editRecords(session.user.role) ? <ButtonLink to="/aircraft/new">Add aircraft</ButtonLink> : null}
      />
      <div className="mb-4">
        <SearchBox label="Search registration, type or owner" value={params.q} onChange={(q) => update({ q })} />
      </div>
      {list.data ? <AircraftTable page={list.data} params={params} onChange={update} busy={list.isPlaceholderData} /> : <Loading />}
    </>
  );
}
