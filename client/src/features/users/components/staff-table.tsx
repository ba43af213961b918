import { ROLE_LABELS, STAFF_ROLES, type Page, type Role, type UserDto } from '@wingstage/shared';
import { createColumnHelper } from '@tanstack/react-table';
import { useId, useState } from 'react';
import { ListTable } from '@/components/ui/data-table';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { isApiError } from '@/lib/api-client';
import type { ListParams } from '@/lib/list-params';
import { useResendInvitation } from '../api/resend-invitation';
import { useUpdateUser } from '../api/update-user';

function statusOf(u: UserDto): string {
  if (!u.active) return 'Deactivated';
  if (u.invited) return 'Invited, not yet joined';
  return 'Active';
}

/** What a change of role gives or takes away, said before it is confirmed. */
const ROLE_MEANS: Record<Exclude<Role, 'owner'>, string> = {
  admin: 'they can change the workshop settings, staff and roles',
  manager: 'they can book jobs in, price estimates and send findings to owners',
  engineer: 'they work checklists, raise findings and log time in the hangar',
  accounts: 'they take payments and see the money, but do not change jobs',
};

function RowActions({ user, selfId, onProblem }: { user: UserDto; selfId: string; onProblem: (m: string | null) => void }) {
  const update = useUpdateUser();
  const resend = useResendInvitation();
  const self = user.id === selfId;
  // The row renders twice (table on a desktop, card on a phone), so ids must not come from the user id.
  const selectId = useId();
  // A new role waits here until it is confirmed; the drop-down alone changes nothing.
  const [pending, setPending] = useState<Exclude<Role, 'owner'> | null>(null);
  const run = async (fn: () => Promise<unknown>, done?: string) => {
    onProblem(null);
    try {
      await fn();
      if (done) onProblem(done);
    } catch (e) {
      onProblem(isApiError(e) ? e.message : 'That change could not be saved.');
    }
  };
  return (
    <div className="flex flex-wrap items-center gap-2">
      {user.role !== 'owner' ? (
        <>
          <label htmlFor={selectId} className="sr-only">
            Role for {user.name}
          </label>
          <select
            id={selectId}
            value={pending ?? user.role}
            disabled={self || update.isPending}
            onChange={(e) => {
              const next = e.target.value as Exclude<Role, 'owner'>;
              onProblem(null);
              setPending(next === user.role ? null : next);
            }}
            className="min-h-10 rounded-control border border-seam-strong bg-cloth-raised px-2 text-sm"
          >
            {STAFF_ROLES.map((r) => (
              <option key={r} value={r}>
                {ROLE_LABELS[r]}
              </option>
            ))}
          </select>
          {pending ? (
            <div role="group" aria-label={`Confirm the new role for ${user.name}`} className="flex w-full flex-col gap-2 rounded-control border border-seam-strong bg-cloth-raised p-2 text-sm">
              <p>
                Make {user.name} {ROLE_LABELS[pending].toLowerCase()} instead of {ROLE_LABELS[user.role].toLowerCase()}? As {ROLE_LABELS[pending].toLowerCase()}, {ROLE_MEANS[pending]}.
              </p>
              <div className="flex flex-wrap gap-2">
                <Button
                  busy={update.isPending}
                  onClick={() =>
                    void run(async () => {
                      await update.mutateAsync({ id: user.id, body: { role: pending } });
                      setPending(null);
                    }, `${user.name} is now ${ROLE_LABELS[pending].toLowerCase()}.`)
                  }
                >
                  Change role
                </Button>
                <Button variant="quiet" onClick={() => setPending(null)}>
                  Keep {ROLE_LABELS[user.role].toLowerCase()}
                </Button>
              </div>
            </div>
          ) : null}
        </>
      ) : null}
      {user.invited && user.active ? (
        <Button variant="quiet" onClick={() => void run(() => resend.mutateAsync(user.id), `A fresh link is on its way to ${user.email}.`)}>
          Resend invitation<span className="sr-only"> to {user.name}</span>
        </Button>
      ) : null}
      {!self ? (
        <Button
          variant="secondary"
          busy={update.isPending}
          onClick={() => {
            if (user.active && !window.confirm(`Deactivate ${user.name}? They will be signed out and cannot sign in again until reactivated.`)) return;
            void run(() => update.mutateAsync({ id: user.id, body: { active: !user.active } }));
          }}
        >
          {user.active ? 'Deactivate' : 'Reactivate'}
          <span className="sr-only"> {user.name}</span>
        </Button>
      ) : (
        <span className="text-sm text-slate-soft">This is you</span>
      )}
    </div>
  );
}

const col = createColumnHelper<UserDto>();

export function StaffTable({ page, params, onChange, selfId, busy }: { page: Page<UserDto>; params: ListParams; onChange: (p: Record<string, string | number | undefined>) => void; selfId: string; busy?: boolean }) {
  const [problem, setProblem] = useState<string | null>(null);
  const columns = [
    col.accessor('name', { header: 'Name', meta: { primary: true }, cell: (c) => <span className="font-semibold">{c.getValue()}</span> }),
    col.accessor('email', { header: 'E-mail', cell: (c) => <span className="break-all">{c.getValue()}</span> }),
    col.accessor('role', { header: 'Role', cell: (c) => ROLE_LABELS[c.getValue()] }),
    col.display({ id: 'status', header: 'Status', cell: (c) => statusOf(c.row.original) }),
    col.display({ id: 'actions', header: 'Change', cell: (c) => <RowActions user={c.row.original} selfId={selfId} onProblem={setProblem} /> }),
  ];
  return (
    <div className="flex flex-col gap-3">
      {problem ? <Notice>{problem}</Notice> : null}
      <ListTable
        caption="Staff and sign-ins"
        columns={columns}
        page={page}
        params={params}
        onChange={onChange}
        busy={busy}
      />
    </div>
  );
}
