import { Text, View } from '@react-pdf/renderer';
import { FINDING_CATEGORY_LABELS } from '@wingstage/shared';
import type { DecisionRecordDocument } from '../types.js';
import { DocumentFrame, Facts, H2, H3, Notice, P, RECORD_NOT_VERDICT, Sums, Table, money, moment, quantity, s, type Row } from './kit.js';
import { percent } from './invoice.js';

const DECISION_WORDS = { approve: 'Approved', decline: 'Declined' } as const;

/**
 * What the owner was asked (the items and prices exactly as the request's snapshot froze them),
 * each decision, who typed their name, when, from which address and device, and the snapshot's hash.
 */
export function DecisionRecordPdf({ doc }: { doc: DecisionRecordDocument }) {
  const c = doc.currency;
  return (
    <DocumentFrame title="Decision record" reference={doc.job.number} subject={`Decision record for job ${doc.job.number}, ${doc.job.registration}`} letterhead={doc.supplier}>
      <Facts
        rows={[
          ['Job', `${doc.job.number} · ${doc.job.title}`],
          ['Aircraft', `${doc.job.registration} · ${doc.job.aircraft}`],
          ['Owner', doc.ownerName],
          ['Sent to the owner', moment(doc.sentAt)],
          ['Link valid until', moment(doc.expiresAt)],
          ['Where this request stands', doc.stateWords],
        ]}
      />
      {doc.message.trim() !== '' && (
        <View style={{ marginTop: 8 }}>
          <Text style={s.small}>The workshop’s message with the request</Text>
          <P>{doc.message}</P>
        </View>
      )}

      <H2>What was asked, and the decisions</H2>
      <Text style={[s.small, { marginBottom: 4 }]}>Prices as the owner saw them when the request was sent (including VAT; VAT worked out as: {doc.roundingLabel}).</Text>
      {doc.items.map((it, i) => (
        <View key={i} style={{ marginBottom: 6 }}>
          <View wrap={false} minPresenceAhead={40}>
            <H3>{it.name}</H3>
            {it.category ? <Text style={s.small}>Category: {FINDING_CATEGORY_LABELS[it.category]}</Text> : null}
            {it.found ? <Text style={s.small}>{it.found}</Text> : null}
          </View>
          <Table
            columns={[
              { label: 'Description', flex: 5 },
              { label: 'Quantity', flex: 1.1, align: 'right' },
              { label: 'VAT rate', flex: 0.9, align: 'right' },
              { label: 'Amount excl. VAT', flex: 1.5, align: 'right' },
            ]}
            rows={[
              ...it.lines.map((l): Row => ({ cells: [l.description, quantity(l.quantity), percent(l.vatPercent), money(l.net, c)] })),
              { kind: 'sum', cells: ['Price shown incl. VAT', '', '', money(it.gross, c)] },
            ]}
          />
          <View style={[s.factRow, { borderBottomWidth: 0 }]} wrap={false}>
            <Text style={s.factLabel}>Decision</Text>
            <View style={s.factValue}>
              <Text style={s.strong}>{it.decision ? DECISION_WORDS[it.decision] : 'No decision recorded'}</Text>
              {it.note.trim() !== '' ? <Text>Owner’s note: {it.note}</Text> : null}
            </View>
          </View>
        </View>
      ))}

      {doc.openingUp.length > 0 && (
        <View>
          <H3>Opening-up work shared by these items</H3>
          <Table
            columns={[
              { label: 'Task', flex: 4 },
              { label: 'Needed by', flex: 3 },
              { label: 'Price shown incl. VAT', flex: 1.6, align: 'right' },
            ]}
            rows={doc.openingUp.map((o): Row => ({ cells: [{ text: o.name, sub: o.charged === null ? null : o.charged ? 'Charged with this decision' : 'Not charged' }, o.neededBy.join(', '), money(o.gross, c)] }))}
          />
        </View>
      )}

      <Sums width={300} rows={doc.figures.map((f) => ({ label: f.label, value: money(f.gross, c), strong: f.strong }))} />

      <H2>Who decided, when and from where</H2>
      {doc.decided ? (
        <Facts
          rows={[
            ['Name typed to confirm', doc.decided.byName],
            ['When', moment(doc.decided.at)],
            ['From (network address)', doc.decided.ip ?? 'Not recorded'],
            ['Device (browser’s own description)', doc.decided.device ?? 'Not recorded'],
          ]}
        />
      ) : (
        <P>No decision has been recorded for this request.</P>
      )}
      <View style={s.box} wrap={false}>
        <Text style={s.small}>Fingerprint of what the owner was shown (SHA-256 of the request as sent)</Text>
        <Text style={{ fontSize: 8.5, marginTop: 2 }}>{doc.snapshotHash}</Text>
        <Text style={[s.small, { marginTop: 2 }]}>Request reference {doc.requestId}</Text>
      </View>
      <Notice>
        <Text>{RECORD_NOT_VERDICT}</Text>
      </Notice>
    </DocumentFrame>
  );
}
