import { CUSTOMER_KIND_LABELS } from '@wingstage/shared';
import { useQuery, useSuspenseQuery } from '@tanstack/react-query';
import { Link, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { ButtonLink } from '@/components/ui/button-link';
import { Loading } from '@/components/ui/notice';
import { Card, Facts, PageHeader } from '@/components/ui/page';
import { aircraftListQueryOptions } from '@/features/aircraft/api/get-aircraft-list';
import { customerQueryOptions } from '@/features/customers/api/get-customer';
import { InviteOwnerPanel } from '@/features/customers/components/invite-owner-panel';
import { formatHours } from '@/lib/format';
import { can } from '@/lib/permissions';
import { queryClient } from '@/lib/query-client';
import { OFFICE, requireSession } from '../../guards';
import { useCurrentSession } from '../../use-current-session';

export async function loader({ request, params }: LoaderFunctionArgs) {
  await requireSession(request, OFFICE);
  await queryClient.ensureQueryData(customerQueryOptions(params.id!));
  return null;
}

export function Component() {
  const { id } = useParams() as { id: string };
  const session = useCurrentSession();
  const { data: c } = useSuspenseQuery(customerQueryOptions(id));
  const aircraft = useQuery(aircraftListQueryOptions({ customerId: id, pageSize: 100, sort: 'registration', dir: 'asc' }));
  const editor = can.editRecords(session.user.role);
  return (
    <>
      <PageHeader
        back={{ to: '/owners', label: 'Owners' }}
        title={c.name}
        lead={CUSTOMER_KIND_LABELS[c.kind]}
        actions={
          editor ? (
            <ButtonLink to={`/owners/${c.id}/edit`} variant="secondary">
              Edit owner
            </ButtonLink>
          ) : null
        }
      />
      <div className="grid items-start gap-5 lg:grid-cols-[3fr_2fr]">
        <div className="flex flex-col gap-5">
          <Card title="Contact">
            <Facts
              items={[
                { label: 'E-mail', value: <a href={`mailto:${c.email}`} className="break-all">{c.email}</a> },
                { label: 'Phone', value: c.phone ? <a href={`tel:${c.phone.replace(/\s/g, '')}`}>{c.phone}</a> : '' },
                { label: 'Address', value: c.addressLines || c.postcode ? <span className="whitespace-pre-line">{[c.addressLines, c.postcode].filter(Boolean).join('\n')}</span> : '' },
                { label: 'Wingstage sign-in', value: c.hasSignIn ? 'Yes' : 'Not yet' },
                { label: 'Notes', value: c.notes ? <span className="whitespace-pre-line">{c.notes}</span> : '' },
              ]}
            />
          </Card>
          <Card
            title="Aircraft"
            actions={
              editor ? (
                <ButtonLink to={`/aircraft/new?customerId=${c.id}`} variant="secondary">
                  Add aircraft
                </ButtonLink>
              ) : null
            }
          >
            {aircraft.data ? (
              aircraft.data.items.length === 0 ? (
                <p className="text-slate-soft">No aircraft on record for this owner.</p>
              ) : (
                <ul className="divide-y divide-seam">
                  {aircraft.data.items.map((a) => (
                    <li key={a.id} className="flex flex-wrap items-baseline justify-between gap-2 py-2">
                      <span>
                        <Link to={`/aircraft/${a.id}`} className="font-semibold tracking-wide">
                          {a.registration}
                        </Link>{' '}
                        <span className="text-slate-soft">{a.type}</span>
                      </span>
                      <span className="text-sm tabular-nums text-slate-soft">
                        {formatHours(a.airframeHours)} · {a.openJobCount === 1 ? '1 open job' : `${a.openJobCount} open jobs`}
                      </span>
                    </li>
                  ))}
                </ul>
              )
            ) : (
              <Loading />
            )}
          </Card>
        </div>
        {can.inviteOwner(session.user.role) ? (
          <Card title="Invite to Wingstage">
            <InviteOwnerPanel customer={c} />
          </Card>
        ) : null}
      </div>
    </>
  );
}
