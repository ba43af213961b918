import { Text, View } from '@react-pdf/renderer';
import type { EstimateStage } from '@wingstage/shared';
import type { EstimateDocument } from '../types.js';
import { DocumentFrame, Facts, H2, Notice, P, Party, RECORD_NOT_VERDICT, Table, day, money, moment, quantity, s, type Row } from './kit.js';
import { percent } from './invoice.js';

const STAGE_HEADINGS: Record<EstimateStage, { title: string; owner: string; staff: string }> = {
  inspection: { title: 'Inspection scope', owner: 'The work quoted before the inspection.', staff: 'The quote: the inspection scope.' },
  discovered: { title: 'Discovered work', owner: 'Work found during the inspection, waiting for your decision.', staff: 'Priced findings not yet decided by the owner.' },
  approved: { title: 'Approved work', owner: 'Work found during the inspection that you approved.', staff: 'Findings the owner approved.' },
  declined: { title: 'Declined work', owner: 'Work you declined: kept here for the record and not charged.', staff: 'Findings the owner declined: kept for the record, not charged.' },
};

/** The estimate as it stands: its four stages with their totals, opening-up work, the totals and the cautions. */
export function EstimatePdf({ doc }: { doc: EstimateDocument }) {
  const c = doc.currency;
  const owner = doc.audience === 'owner';
  const anyDiscount = doc.stages.some((st) => st.lines.some((l) => !/^0(\.0+)?$/.test(l.discount)));
  return (
    <DocumentFrame title="Estimate" reference={doc.job.number} subject={`Estimate for job ${doc.job.number}, ${doc.job.registration}`} letterhead={doc.supplier}>
      <View style={s.columns}>
        <Party heading={owner ? 'Prepared for' : 'Owner'} name={doc.customer.name} lines={[...doc.customer.addressLines, doc.customer.postcode]} />
        <View style={s.column}>
          <Facts
            rows={[
              ['Job', `${doc.job.number} · ${doc.job.title}`],
              ['Aircraft', `${doc.job.registration} · ${doc.job.aircraft}`],
              ['Where the job stands', doc.job.state],
              ['Printed', moment(doc.printedAt)],
            ]}
          />
        </View>
      </View>
      <P style={[s.note, { marginTop: 8 }]}>
        An estimate, not a VAT invoice: it shows the work and prices as they stand on the day printed, and may change as the work goes on. Prices include
        VAT where marked; VAT worked out as: {doc.roundingLabel}.
      </P>

      {doc.stages.map((st) => {
        const h = STAGE_HEADINGS[st.stage];
        const rows: Row[] = [];
        let finding: string | null = null;
        for (const l of st.lines) {
          if (l.finding && l.finding !== finding) rows.push({ group: l.finding });
          finding = l.finding;
          rows.push({
            cells: [
              { text: l.description, sub: l.agreed === null ? null : l.agreed ? 'Agreed' : 'Not yet agreed' },
              `${quantity(l.quantity)}${l.unit ? ` ${l.unit}` : ''}`,
              ...(anyDiscount ? [/^0(\.0+)?$/.test(l.discount) ? '–' : money(l.discount, c)] : []),
              percent(l.vatPercent),
              money(l.net, c),
            ],
          });
        }
        if (st.lines.length) rows.push({ kind: 'sum', cells: [`${h.title}: total excl. VAT`, '', ...(anyDiscount ? [''] : []), '', money(st.totals.net, c)] });
        return (
          <View key={st.stage}>
            <H2>{h.title}</H2>
            <Text style={[s.small, { marginBottom: 3 }]}>{owner ? h.owner : h.staff}</Text>
            <Table
              columns={[
                { label: 'Description', flex: 5 },
                { label: 'Quantity', flex: 1.1, align: 'right' },
                ...(anyDiscount ? [{ label: 'Discount', flex: 1.1, align: 'right' as const }] : []),
                { label: 'VAT rate', flex: 0.9, align: 'right' },
                { label: 'Amount excl. VAT', flex: 1.5, align: 'right' },
              ]}
              rows={rows}
              empty="Nothing at this stage."
            />
            {st.lines.length > 0 && (
              <Text style={[s.small, { textAlign: 'right' }]}>
                VAT {money(st.totals.vat, c)} · total incl. VAT {money(st.totals.gross, c)}
              </Text>
            )}
          </View>
        );
      })}

      {doc.accessTasks.length > 0 && (
        <View>
          <H2>Opening-up work</H2>
          <Text style={[s.small, { marginBottom: 3 }]}>Access needed by several items, charged once with the first item that needs it.</Text>
          <Table
            columns={[
              { label: 'Task', flex: 5 },
              { label: 'Hours', flex: 1.1, align: 'right' },
              { label: 'Charged with', flex: 1.8 },
              { label: 'VAT rate', flex: 0.9, align: 'right' },
              { label: 'Amount excl. VAT', flex: 1.5, align: 'right' },
            ]}
            rows={doc.accessTasks.map((t): Row => ({
              cells: [t.name, quantity(t.hours), t.chargedIn ? STAGE_HEADINGS[t.chargedIn].title : 'Not needed yet', percent(t.vatPercent), money(t.net, c)],
            }))}
          />
        </View>
      )}

      <H2>Totals</H2>
      <Table
        columns={[
          { label: '', flex: 3.2 },
          { label: 'Excl. VAT', flex: 1.3, align: 'right' },
          { label: 'VAT', flex: 1.2, align: 'right' },
          { label: 'Incl. VAT', flex: 1.3, align: 'right' },
        ]}
        rows={doc.totals.map((t): Row => ({ kind: t.strong ? 'sum' : 'line', cells: [t.label, money(t.net, c), money(t.vat, c), money(t.gross, c)] }))}
      />

      <H2>Cautions</H2>
      {doc.cautions.length === 0 ? (
        <P>No cautions are recorded on this job’s scope or checklist.</P>
      ) : (
        <Table columns={[{ label: 'Where', flex: 2 }, { label: 'Caution', flex: 5 }]} rows={doc.cautions.map((x): Row => ({ cells: [x.where, x.caution] }))} />
      )}
      <Notice>
        <Text>{RECORD_NOT_VERDICT}</Text>
      </Notice>
      <Text style={s.note}>Printed {day(doc.printedAt.slice(0, 10))} from Wingstage.</Text>
    </DocumentFrame>
  );
}
