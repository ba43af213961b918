import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { USER_KINDS, type UserKind } from '@wingstage/shared';
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
/** Staff first: owners' sign-ins are looked after by managers and are one choice away. */
const KINDS: { id: UserKind; label: string }[] = [
  { id: 'staff', label: 'Staff' },
  { id: 'owners', label: 'Owners' },
  { id: 'all', label: 'Everyone' },
];
const readKind = (v: unknown): UserKind => (USER_KINDS as readonly unknown[]).includes(v) ? (v as UserKind) : 'staff';
const toQuery = (p: ListParams) => ({ q: p.q, sort: p.sort, dir: p.dir, page: p.page, pageSize: p.pageSize, kind: readKind(p.kind) });

export async function loader({ request }: LoaderFunctionArgs) {
  await requireSession(request, ADMIN);
  await queryClient.ensureQueryData(usersQueryOptions(toQuery(readListParams(new URL(request.url).searchParams, DEFAULTS, ['kind']))));
  return null;
}

export function Component() {
  const session = useCurrentSession();
  const [params, update] = useListParams(DEFAULTS, ['kind']);
  const kind = readKind(params.kind);
  const list = useQuery({ ...usersQueryOptions(toQuery(params)), placeholderData: keepPreviousData });
  return (
    <>
      <PageHeader title="Staff" lead="Everyone who signs in to this workshop, and the role each one has." />
      <div className="flex flex-col gap-5">
        <Card title="Invite a member of staff">
          <InviteStaffForm />
        </Card>
        <Card title="Sign-ins">
          <div className="mb-4 flex flex-col gap-3">
            <div role="group" aria-label="Show sign-ins of" className="flex flex-wrap gap-2">
              {KINDS.map((k) => (
                <button
                  key={k.id}
                  type="button"
                  aria-pressed={kind === k.id}
                  onClick={() => update({ kind: k.id === 'staff' ? undefined : k.id })}
                  className={`min-h-11 rounded-control border px-4 font-semibold ${
                    kind === k.id ? 'border-harbour bg-harbour text-on-harbour' : 'border-seam-strong bg-cloth-raised hover:bg-cloth-sunk'
                  }`}
                >
                  {kind === k.id ? <span aria-hidden="true">● </span> : null}
                  {k.label}
                </button>
              ))}
            </div>
            <SearchBox label="Search name or e-mail" value={params.q} onChange={(q) => update({ q })} />
          </div>
          {list.data ? <StaffTable page={list.data} params={params} onChange={update} selfId={session.user.id} busy={list.isPlaceholderData} /> : <Loading />}
        </Card>
      </div>
    </>
  );
}
