import { workshopPricingFrom, type PartDto, type SupplierDto } from '@wingstage/shared';
import { useQuery, useSuspenseQuery } from '@tanstack/react-query';
import { useState } from 'react';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { SearchBox } from '@/components/ui/data-table';
import { Loading } from '@/components/ui/notice';
import { Card, PageHeader } from '@/components/ui/page';
import { suppliersQueryOptions } from '@/lib/catalogue-suppliers';
import { partsQueryOptions, type PartListParams } from '@/lib/catalogue-parts';
import { PartForm } from '@/features/catalogue/components/part-form';
import { PartsTable } from '@/features/catalogue/components/parts-table';
import { SupplierForm } from '@/features/catalogue/components/supplier-form';
import { SuppliersTable } from '@/features/catalogue/components/suppliers-table';
import { workshopQueryOptions } from '@/features/workshop/api/get-workshop';
import { formatMoney } from '@/lib/format';
import { readListParams, useListParams, type ListParams } from '@/lib/list-params';
import { can } from '@/lib/permissions';
import { queryClient } from '@/lib/query-client';
import { requireSession, STAFF } from '../guards';
import { useCurrentSession } from '../use-current-session';

type Show = 'parts' | 'suppliers' | 'labour';
const SHOWS: { id: Show; label: string }[] = [
  { id: 'parts', label: 'Parts' },
  { id: 'suppliers', label: 'Suppliers' },
  { id: 'labour', label: 'Labour rates' },
];
const readShow = (v: unknown): Show => (v === 'suppliers' || v === 'labour' ? v : 'parts');
const listQuery = (p: ListParams): PartListParams => ({ q: p.q, sort: p.sort, dir: p.dir, page: p.page, pageSize: p.pageSize });
const DEFAULTS = { sort: undefined, dir: 'asc' as const };

export async function loader({ request }: LoaderFunctionArgs) {
  await requireSession(request, STAFF);
  const params = readListParams(new URL(request.url).searchParams, DEFAULTS, ['show']);
  await Promise.all([
    queryClient.ensureQueryData(workshopQueryOptions()),
    readShow(params.show) === 'parts' ? queryClient.ensureQueryData(partsQueryOptions(listQuery(params))) : null,
    readShow(params.show) === 'suppliers' ? queryClient.ensureQueryData(suppliersQueryOptions(listQuery(params))) : null,
  ]);
  return null;
}

export function Component() {
  const session = useCurrentSession();
  const editor = can.editCatalogue(session.user.role);
  const [params, update] = useListParams(DEFAULTS, ['show']);
  const show = readShow(params.show);
  const { data: workshop } = useSuspenseQuery(workshopQueryOptions());
  const pricing = workshopPricingFrom(workshop);
  const parts = useQuery({ ...partsQueryOptions(listQuery(params)), enabled: show === 'parts' });
  const suppliers = useQuery({ ...suppliersQueryOptions(listQuery(params)), enabled: show === 'suppliers' });
  const [editingPart, setEditingPart] = useState<PartDto | 'new' | null>(null);
  const [editingSupplier, setEditingSupplier] = useState<SupplierDto | 'new' | null>(null);

  return (
    <>
      <PageHeader title="Catalogue" lead="Parts, suppliers for work sent out, and the labour rates estimates are priced with." />
      <nav aria-label="Catalogue sections" className="mb-4 flex flex-wrap gap-2">
        {SHOWS.map((s) => (
          <button
            key={s.id}
            type="button"
            aria-current={show === s.id ? 'page' : undefined}
            onClick={() => update({ show: s.id === 'parts' ? undefined : s.id, q: undefined, sort: undefined, dir: undefined })}
            className={`min-h-11 rounded-control border px-4 font-semibold ${
              show === s.id ? 'border-harbour bg-harbour text-on-harbour' : 'border-seam-strong bg-cloth-raised hover:bg-cloth-sunk'
            }`}
          >
            {show === s.id ? <span aria-hidden="true">● </span> : null}
            {s.label}
          </button>
        ))}
      </nav>

      {show === 'parts' ? (
        <>
          {editingPart ? (
            <Card title={editingPart === 'new' ? 'Add a part' : `Edit ${editingPart.partNumber}`} className="mb-5">
              <PartForm
                key={editingPart === 'new' ? 'new' : `${editingPart.id}:${editingPart.version}`}
                part={editingPart === 'new' ? null : editingPart}
                pricing={pricing}
                onDone={() => setEditingPart(null)}
              />
            </Card>
          ) : null}
          <div className="mb-4 flex flex-col gap-3 sm:flex-row sm:items-center sm:justify-between">
            <SearchBox label="Search parts" value={params.q} onChange={(q) => update({ q })} />
            {editor && !editingPart ? <Button onClick={() => setEditingPart('new')}>Add part</Button> : null}
          </div>
          {parts.data ? (
            <PartsTable page={parts.data} params={params} currency={workshop.currency} onChange={update} onEdit={editor ? setEditingPart : undefined} busy={parts.isPlaceholderData} />
          ) : parts.isError ? (
            <p>The parts could not be loaded.</p>
          ) : (
            <Loading />
          )}
        </>
      ) : null}

      {show === 'suppliers' ? (
        <>
          {editingSupplier ? (
            <Card title={editingSupplier === 'new' ? 'Add a supplier' : `Edit ${editingSupplier.name}`} className="mb-5">
              <SupplierForm
                key={editingSupplier === 'new' ? 'new' : `${editingSupplier.id}:${editingSupplier.version}`}
                supplier={editingSupplier === 'new' ? null : editingSupplier}
                onDone={() => setEditingSupplier(null)}
              />
            </Card>
          ) : null}
          <div className="mb-4 flex flex-col gap-3 sm:flex-row sm:items-center sm:justify-between">
            <SearchBox label="Search suppliers" value={params.q} onChange={(q) => update({ q })} />
            {editor && !editingSupplier ? <Button onClick={() => setEditingSupplier('new')}>Add supplier</Button> : null}
          </div>
          {suppliers.data ? (
            <SuppliersTable page={suppliers.data} params={params} onChange={update} onEdit={editor ? setEditingSupplier : undefined} busy={suppliers.isPlaceholderData} />
          ) : suppliers.isError ? (
            <p>The suppliers could not be loaded.</p>
          ) : (
            <Loading />
          )}
        </>
      ) : null}

      {show === 'labour' ? (
        <Card title="Labour rates">
          <ul className="flex flex-col divide-y divide-seam">
            {workshop.labourRates.map((r) => (
              <li key={r.code} className="flex flex-wrap items-baseline justify-between gap-2 py-2">
                <span className="font-semibold">{r.name}</span>
                <span className="tabular-nums">{formatMoney(r.ratePerHour, workshop.currency, { vat: 'excl' })} per hour</span>
              </li>
            ))}
          </ul>
          <p className="mt-3 text-sm text-slate-soft">Rates are set by an admin in Settings; estimate lines copy the rate when they are added.</p>
        </Card>
      ) : null}
    </>
  );
}
