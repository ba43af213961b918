import {
  ESTIMATE_STAGES,
  VAT_RATE_CODES,
  type EstimateLineDto,
  type EstimateStage,
  type FindingCategory,
  type LineKind,
  type PartDto,
  type SupplierDto,
  type VatRateCode,
  type WorkshopDto,
} from '@wingstage/shared';
import { useId, type ReactNode } from 'react';
import { Button } from '@/components/ui/button';
import { CategoryBadge } from '@/components/ui/finding-badges';
import { CrossIcon } from '@/components/ui/icons';
import { Notice } from '@/components/ui/notice';
import { SearchPicker } from '@/components/ui/search-picker';
import { partPickerSource, supplierPickerSource, type SupplierOption } from '@/lib/catalogue-pickers';
import { formatMoney, moneyForInput } from '@/lib/format';
import { LINE_KIND_LABELS, STAGE_LABELS } from '@/lib/line-kinds';
import { VAT_RATE_LABELS } from '@/lib/pricing-preview';
import { EstimateTotals } from './estimate-totals';
import { EDITABLE_STAGES, newId, type EstimateDraftApi } from './use-estimate-draft';
import { UnsavedChangesGuard } from '@/components/ui/unsaved-changes';

export interface FindingRef {
  id: string;
  number: string;
  title: string;
  category: FindingCategory;
}

const STAGE_NOTES: Record<EstimateStage, string> = {
  inspection: 'The work quoted when the aircraft was booked in.',
  discovered: 'Priced findings waiting for the owner to decide.',
  approved: 'Findings the owner approved. Changed only by the owner’s decisions.',
  declined: 'Findings the owner declined, kept for the record and not charged.',
};

function emptyLine(stage: 'inspection' | 'discovered', kind: LineKind, workshop: WorkshopDto): EstimateLineDto {
  const rate = workshop.labourRates[0];
  return {
    id: newId(),
    stage,
    kind,
    description: '',
    quantity: '1',
    labourRateCode: kind === 'labour' ? (rate?.code ?? null) : null,
    ratePerHour: kind === 'labour' ? (rate?.ratePerHour ?? null) : null,
    partId: null,
    supplierId: null,
    unitCost: kind === 'part' ? '' : null,
    unitPrice: null,
    markupPercent: null,
    amount: kind === 'subcontract' || kind === 'fee' ? '' : null,
    vatRate: 'standard',
    findingId: null,
    accessTaskId: null,
    discountPercent: null,
    // A new line is never agreed: the owner agrees the quote, not the builder.
    agreedAt: null,
    agreedHow: null,
  };
}

function partLine(stage: 'inspection' | 'discovered', part: PartDto): EstimateLineDto {
  return {
    ...emptyLine(stage, 'part', { labourRates: [] } as unknown as WorkshopDto),
    description: `${part.partNumber} ${part.description}`.slice(0, 300),
    partId: part.id,
    supplierId: part.supplierId,
    unitCost: moneyForInput(part.unitCost),
    unitPrice: part.unitPrice ? moneyForInput(part.unitPrice) : null,
    markupPercent: part.markupPercent,
    vatRate: part.vatRate,
  };
}

export function EstimateBuilder({
  draft: api,
  workshop,
  suppliers,
  findings,
  editable,
}: {
  draft: EstimateDraftApi;
  workshop: WorkshopDto;
  suppliers: SupplierDto[];
  findings: FindingRef[];
  editable: boolean;
}) {
  const { draft, live, conflict } = api;
  const currency = workshop.currency;
  const priced = live.priced;
  const lineNet = new Map(priced?.lines.map((l) => [l.id, l.net]) ?? []);
  const findingById = new Map(findings.map((f) => [f.id, f]));

  return (
    <section aria-labelledby="estimate-heading" className="rounded-card border border-seam bg-cloth-raised p-3 sm:p-5">
      <div className="mb-3 flex flex-wrap items-center justify-between gap-2">
        <h2 id="estimate-heading" className="text-lg font-semibold">
          Estimate <span className="text-sm font-normal text-slate-soft tabular-nums">version {draft.baseVersion}</span>
        </h2>
        {editable ? (
          <div className="flex flex-wrap items-center gap-3">
            <span className="text-sm" role="status" data-testid="estimate-save-state">
              {draft.dirty ? (
                <>
                  <span aria-hidden="true">● </span>Unsaved changes
                </>
              ) : api.savedAt ? (
                <>
                  <span aria-hidden="true">✓ </span>Saved
                </>
              ) : null}
            </span>
            <Button onClick={() => void api.save()} busy={api.saving} disabled={!draft.dirty && !conflict}>
              Save estimate
            </Button>
          </div>
        ) : null}
      </div>

      {conflict ? (
        <div className="mb-4">
          <Notice tone="problem" title="Not saved: someone else changed this estimate">
            <p>
              Another person saved the estimate while you were editing it; it is now at version <strong className="tabular-nums">{conflict.theirVersion}</strong>. Your
              unsaved lines are still shown below and nothing has been lost.
            </p>
            {conflict.theirs ? (
              <p className="tabular-nums">
                Their version: quoted {formatMoney(conflict.theirs.priced.quoted.gross, currency, { vat: 'incl' })}, discovered work{' '}
                {formatMoney(conflict.theirs.priced.stages.discovered.gross, currency, { vat: 'incl' })}, {conflict.theirs.lines.length} lines.
              </p>
            ) : null}
            <div className="mt-2 flex flex-wrap gap-2">
              {conflict.theirs ? (
                <Button variant="secondary" onClick={() => api.discard(conflict.theirs!)}>
                  Show their version (drop my changes)
                </Button>
              ) : null}
              <Button variant="secondary" onClick={() => void api.save({ over: conflict.theirVersion })} busy={api.saving}>
                Save mine over theirs
              </Button>
            </div>
          </Notice>
        </div>
      ) : null}
      {api.problem ? (
        <div className="mb-4">
          <Notice tone="problem" title="Not saved">
            {api.problem}
          </Notice>
        </div>
      ) : null}
      {api.large ? (
        <div className="mb-4" data-testid="confirm-large">
          <Notice title="Check these figures before saving">
            <p>These are larger than a light-aircraft job usually needs, so nothing is saved until you confirm them:</p>
            <ul className="list-disc pl-5">
              {api.large.map((f) => (
                <li key={`${f.index}-${f.field}-${f.message}`}>{f.message}</li>
              ))}
            </ul>
            <div className="mt-2 flex flex-wrap gap-2">
              <Button onClick={() => void api.save({ confirmLarge: true, over: conflict?.theirVersion })} busy={api.saving}>
                They are right: save
              </Button>
              <Button variant="secondary" onClick={api.dismissLarge}>
                Let me correct them
              </Button>
            </div>
          </Notice>
        </div>
      ) : null}
      {editable ? <UnsavedChangesGuard when={draft.dirty} what="the estimate" /> : null}

      <div className="grid gap-5 xl:grid-cols-[minmax(0,1fr)_20rem]">
        <div className="flex min-w-0 flex-col gap-5">
          {ESTIMATE_STAGES.map((stage) => {
            const lines = draft.lines.filter((l) => l.stage === stage);
            const canEdit = editable && EDITABLE_STAGES.has(stage);
            if (lines.length === 0 && !canEdit) return null;
            const total = priced?.stages[stage];
            return (
              <section key={stage} aria-label={STAGE_LABELS[stage]} data-stage={stage} className="flex flex-col gap-2">
                <header className="flex flex-wrap items-baseline justify-between gap-2 border-b-2 border-seam-strong pb-1">
                  <h3 className="font-semibold">
                    {stage === 'declined' ? <CrossIcon size={15} className="mr-1 inline" /> : null}
                    {STAGE_LABELS[stage]}
                  </h3>
                  {total ? (
                    <span className="text-sm tabular-nums" data-testid={`stage-head-${stage}`}>
                      {formatMoney(total.net, currency, { vat: 'excl' })} · {formatMoney(total.gross, currency, { vat: 'incl' })}
                    </span>
                  ) : null}
                </header>
                <p className="text-xs text-slate-soft">{STAGE_NOTES[stage]}</p>
                {lines.length === 0 ? <p className="text-sm text-slate-soft">No lines.</p> : null}
                <ul className="flex flex-col gap-2">
                  {lines.map((l) => (
                    <li key={l.id}>
                      {canEdit ? (
                        <EditableLine
                          line={l}
                          net={lineNet.get(l.id)}
                          currency={currency}
                          api={api}
                          workshop={workshop}
                          suppliers={suppliers}
                          finding={l.findingId ? findingById.get(l.findingId) : undefined}
                          error={api.lineErrors[l.id]}
                        />
                      ) : (
                        <ReadLine line={l} net={lineNet.get(l.id)} currency={currency} finding={l.findingId ? findingById.get(l.findingId) : undefined} declined={stage === 'declined'} />
                      )}
                    </li>
                  ))}
                </ul>
                {canEdit ? <AddLine stage={stage as 'inspection' | 'discovered'} api={api} workshop={workshop} /> : null}
              </section>
            );
          })}
          <AccessTasks api={api} workshop={workshop} editable={editable} currency={currency} />
        </div>
        <aside aria-label="Estimate totals" className="xl:sticky xl:top-4 xl:self-start">
          {priced ? <EstimateTotals priced={priced} paused={live.ok ? null : live.problem} /> : <p className="text-sm">Totals appear once every figure is a number.</p>}
        </aside>
      </div>
    </section>
  );
}

function FindingTag({ finding }: { finding: FindingRef }) {
  return (
    <span className="inline-flex flex-wrap items-center gap-1.5 text-xs">
      <span className="font-semibold tabular-nums">{finding.number}</span>
      <CategoryBadge category={finding.category} />
    </span>
  );
}

function ReadLine({ line, net, currency, finding, declined }: { line: EstimateLineDto; net?: string; currency: string; finding?: FindingRef; declined: boolean }) {
  return (
    <div className={`flex flex-wrap items-baseline justify-between gap-2 rounded-control border px-3 py-2 ${declined ? 'border-dashed border-seam-strong' : 'border-seam'}`}>
      <div className="flex min-w-0 flex-col">
        <span className={declined ? 'text-slate-soft' : ''}>
          {declined ? <span className="mr-1 rounded-full border border-seam-strong px-1.5 text-xs font-semibold">Declined</span> : null}
          {line.description}
        </span>
        <span className="text-xs text-slate-soft">
          {LINE_KIND_LABELS[line.kind]} · {line.kind === 'labour' ? `${line.quantity} h` : `× ${line.quantity}`} · VAT {VAT_RATE_LABELS[line.vatRate].toLowerCase()}
        </span>
        {finding ? <FindingTag finding={finding} /> : null}
      </div>
      <span className="tabular-nums">{net !== undefined ? formatMoney(net, currency, { vat: 'excl' }) : '—'}</span>
    </div>
  );
}

/** The workshop's labour rates as a select's options; "Own rate" only while the line has one. */
function LabourRateOptions({ rates, ownRate, currency }: { rates: WorkshopDto['labourRates']; ownRate: boolean; currency: string }) {
  return (
    <>
      {ownRate ? <option value="">Own rate</option> : null}
      {rates.map((r) => (
        <option key={r.code} value={r.code}>
          {r.name} · {formatMoney(r.ratePerHour, currency)}/h
        </option>
      ))}
    </>
  );
}

function Small({ label, children, wide, full }: { label: string; children: (id: string) => ReactNode; wide?: boolean; full?: boolean }) {
  const id = useId();
  return (
    <div className={`flex flex-col gap-0.5 ${full ? '' : wide ? 'min-w-40 flex-[2_1_10rem]' : 'min-w-24 flex-[1_1_6rem]'}`}>
      <label htmlFor={id} className="text-xs font-semibold text-slate-soft">
        {label}
      </label>
      {children(id)}
    </div>
  );
}

const inputClass = 'min-h-10 w-full rounded-control border border-seam-strong bg-cloth-raised px-2 py-1 text-base tabular-nums';

function EditableLine({
  line: l,
  net,
  currency,
  api,
  workshop,
  suppliers,
  finding,
  error,
}: {
  line: EstimateLineDto;
  net?: string;
  currency: string;
  api: EstimateDraftApi;
  workshop: WorkshopDto;
  suppliers: SupplierDto[];
  finding?: FindingRef;
  error?: string;
}) {
  const set = (patch: Partial<EstimateLineDto>) => api.updateLine(l.id, patch);
  const opt = (v: string) => (v.trim() === '' ? null : v.trim());
  return (
    <div className={`flex flex-col gap-2 rounded-control border bg-cloth p-2.5 ${error ? 'border-2 border-fault' : 'border-seam'}`} data-line-kind={l.kind}>
      <div className="flex flex-wrap items-center justify-between gap-2">
        <span className="text-xs font-semibold uppercase tracking-wide text-slate-soft">{LINE_KIND_LABELS[l.kind]}</span>
        {finding ? <FindingTag finding={finding} /> : null}
        <span className="ml-auto font-semibold tabular-nums" data-testid="line-net">
          {net !== undefined ? formatMoney(net, currency, { vat: 'excl' }) : '—'}
        </span>
        <Button variant="quiet" className="min-h-8 px-2" onClick={() => api.removeLine(l.id)} aria-label={`Remove line ${l.description || LINE_KIND_LABELS[l.kind]}`}>
          Remove
        </Button>
      </div>
      <Small label="Description" full>
        {(id) => <input id={id} className={inputClass} value={l.description} onChange={(e) => set({ description: e.target.value })} />}
      </Small>
      <div className="flex flex-wrap gap-2">
        {l.kind === 'labour' ? (
          <>
            <Small label="Hours">{(id) => <input id={id} inputMode="decimal" className={inputClass} value={l.quantity} onChange={(e) => set({ quantity: e.target.value.trim() })} />}</Small>
            <Small label="Labour rate" wide>
              {(id) => (
                <select
                  id={id}
                  className={inputClass}
                  value={l.labourRateCode ?? ''}
                  onChange={(e) => {
                    const r = workshop.labourRates.find((x) => x.code === e.target.value);
                    set({ labourRateCode: r?.code ?? null, ratePerHour: r?.ratePerHour ?? l.ratePerHour });
                  }}
                >
                  <LabourRateOptions rates={workshop.labourRates} ownRate={l.labourRateCode === null} currency={currency} />
                </select>
              )}
            </Small>
          </>
        ) : null}
        {l.kind === 'part' ? (
          <>
            <Small label="Quantity">{(id) => <input id={id} inputMode="decimal" className={inputClass} value={l.quantity} onChange={(e) => set({ quantity: e.target.value.trim() })} />}</Small>
            <Small label="Unit cost">{(id) => <input id={id} inputMode="decimal" className={inputClass} value={l.unitCost ?? ''} onChange={(e) => set({ unitCost: opt(e.target.value) })} />}</Small>
            <Small label="Mark-up %">
              {(id) => (
                <input
                  id={id}
                  inputMode="decimal"
                  className={inputClass}
                  placeholder={workshop.settings.partsMarkupPercent}
                  value={l.markupPercent ?? ''}
                  disabled={l.unitPrice !== null}
                  onChange={(e) => set({ markupPercent: opt(e.target.value) })}
                />
              )}
            </Small>
            <Small label="Fixed sell price">
              {(id) => <input id={id} inputMode="decimal" className={inputClass} placeholder="none" value={l.unitPrice ?? ''} onChange={(e) => set({ unitPrice: opt(e.target.value), markupPercent: null })} />}
            </Small>
          </>
        ) : null}
        {l.kind === 'subcontract' ? (
          <>
            <div className="min-w-56 flex-[2_1_14rem]">
              {/* Searches every supplier on the server; the names passed in only label the one already chosen. */}
              <SearchPicker<SupplierOption>
                label="Supplier"
                labelClassName="text-xs font-semibold text-slate-soft"
                source={supplierPickerSource}
                value={l.supplierId}
                selected={suppliers.find((s) => s.id === l.supplierId) ?? null}
                placeholder={l.supplierId && !suppliers.some((s) => s.id === l.supplierId) ? 'Chosen — type to change' : 'Type a supplier name'}
                onChange={(id) => set({ supplierId: id })}
              />
            </div>
            <Small label="Supplier's cost">{(id) => <input id={id} inputMode="decimal" className={inputClass} value={l.amount ?? ''} onChange={(e) => set({ amount: e.target.value.trim() })} />}</Small>
            <Small label="Mark-up %">
              {(id) => <input id={id} inputMode="decimal" className={inputClass} placeholder={workshop.settings.subcontractMarkupPercent} value={l.markupPercent ?? ''} onChange={(e) => set({ markupPercent: opt(e.target.value) })} />}
            </Small>
          </>
        ) : null}
        {l.kind === 'fee' ? (
          <Small label="Fee">{(id) => <input id={id} inputMode="decimal" className={inputClass} value={l.amount ?? ''} onChange={(e) => set({ amount: e.target.value.trim() })} />}</Small>
        ) : null}
        <Small label="VAT">
          {(id) => (
            <select id={id} className={inputClass} value={l.vatRate} onChange={(e) => set({ vatRate: e.target.value as VatRateCode })}>
              {VAT_RATE_CODES.map((c) => (
                <option key={c} value={c}>
                  {VAT_RATE_LABELS[c]}
                </option>
              ))}
            </select>
          )}
        </Small>
        {api.draft.accessTasks.length > 0 ? (
          <Small label="Needs access task" wide>
            {(id) => (
              <select id={id} className={inputClass} value={l.accessTaskId ?? ''} onChange={(e) => set({ accessTaskId: e.target.value || null })}>
                <option value="">None</option>
                {api.draft.accessTasks.map((t) => (
                  <option key={t.id} value={t.id}>
                    {t.name || 'Unnamed access task'}
                  </option>
                ))}
              </select>
            )}
          </Small>
        ) : null}
      </div>
      {error ? (
        <p className="text-sm font-semibold text-fault" role="alert">
          <span aria-hidden="true">▲ </span>
          {error}
        </p>
      ) : null}
    </div>
  );
}

function AddLine({ stage, api, workshop }: { stage: 'inspection' | 'discovered'; api: EstimateDraftApi; workshop: WorkshopDto }) {
  const add = (kind: LineKind) => api.addLines([emptyLine(stage, kind, workshop)]);
  return (
    <div className="flex flex-wrap items-end gap-2">
      <Button variant="secondary" onClick={() => add('labour')}>
        + Labour
      </Button>
      <SearchPicker<PartDto>
        className="min-w-56 flex-[1_1_14rem] sm:max-w-96"
        label={`Add a catalogue part to ${STAGE_LABELS[stage].toLowerCase()}`}
        hideLabel
        placeholder="+ Part… type to search"
        source={partPickerSource}
        value={null}
        clearAfterPick
        onChange={(_id, p) => {
          if (p) api.addLines([partLine(stage, p)]);
        }}
      />
      <Button variant="secondary" onClick={() => add('part')}>
        + Part not in the catalogue
      </Button>
      <Button variant="secondary" onClick={() => add('subcontract')}>
        + Sub-contract
      </Button>
      <Button variant="secondary" onClick={() => add('fee')}>
        + Fee
      </Button>
    </div>
  );
}

function AccessTasks({ api, workshop, editable, currency }: { api: EstimateDraftApi; workshop: WorkshopDto; editable: boolean; currency: string }) {
  const tasks = api.draft.accessTasks;
  const pricedTasks = new Map(api.live.priced?.accessTasks.map((t) => [t.id, t]) ?? []);
  if (!editable && tasks.length === 0) return null;
  return (
    <section aria-label="Access tasks" className="flex flex-col gap-2">
      <header className="border-b-2 border-seam-strong pb-1">
        <h3 className="font-semibold">Access tasks</h3>
      </header>
      <p className="text-xs text-slate-soft">Opening-up work several remedies share. It is charged once, however many lines name it.</p>
      <ul className="flex flex-col gap-2">
        {tasks.map((t) => {
          const p = pricedTasks.get(t.id);
          return (
            <li key={t.id} className={`flex flex-col gap-2 rounded-control border bg-cloth p-2.5 ${api.lineErrors[t.id] ? 'border-2 border-fault' : 'border-seam'}`}>
              {editable ? (
                <div className="flex flex-wrap gap-2">
                  <Small label="Access task" wide>
                    {(id) => <input id={id} className={inputClass} value={t.name} onChange={(e) => api.updateTask(t.id, { name: e.target.value })} />}
                  </Small>
                  <Small label="Hours">{(id) => <input id={id} inputMode="decimal" className={inputClass} value={t.hours} onChange={(e) => api.updateTask(t.id, { hours: e.target.value.trim() })} />}</Small>
                  <Small label="Labour rate" wide>
                    {(id) => (
                      <select
                        id={id}
                        className={inputClass}
                        value={t.labourRateCode ?? ''}
                        onChange={(e) => {
                          const r = workshop.labourRates.find((x) => x.code === e.target.value);
                          if (r) api.updateTask(t.id, { labourRateCode: r.code, ratePerHour: r.ratePerHour });
                        }}
                      >
                        <LabourRateOptions rates={workshop.labourRates} ownRate={t.labourRateCode === null} currency={currency} />
                      </select>
                    )}
                  </Small>
                </div>
              ) : (
                <span>
                  {t.name} · {t.hours} h
                </span>
              )}
              <div className="flex flex-wrap items-center justify-between gap-2 text-sm">
                <span className="tabular-nums">
                  {p ? formatMoney(p.net, currency, { vat: 'excl' }) : '—'}
                  {p && p.chargedIn ? ` · charged in ${p.chargedIn === 'inspection' ? 'the inspection scope' : p.chargedIn === 'approved' ? 'approved work' : p.chargedIn === 'discovered' ? 'discovered work' : 'declined work'}` : ' · no line uses it yet'}
                  {p && p.committedRemedies > 1 ? ` · shared by ${p.committedRemedies}, saving ${formatMoney(p.savingGross, currency, { vat: 'incl' })}` : ''}
                </span>
                {api.lineErrors[t.id] ? (
                  <span className="font-semibold text-fault" role="alert">
                    ▲ {api.lineErrors[t.id]}
                  </span>
                ) : null}
                {editable ? (
                  <Button variant="quiet" onClick={() => api.removeTask(t.id)} aria-label={`Remove access task ${t.name}`}>
                    Remove
                  </Button>
                ) : null}
              </div>
            </li>
          );
        })}
      </ul>
      {editable ? (
        <div>
          <Button
            variant="secondary"
            onClick={() => {
              const r = workshop.labourRates[0];
              api.addLines([], [{ id: newId(), name: '', hours: '1', labourRateCode: r?.code ?? null, ratePerHour: r?.ratePerHour ?? '0', vatRate: 'standard' }]);
            }}
          >
            + Access task
          </Button>
        </div>
      ) : null}
    </section>
  );
}
