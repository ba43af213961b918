import path from 'node:path';
import { fileURLToPath } from 'node:url';
import type { ComponentProps, ReactNode } from 'react';
import { Document, Font, Page, StyleSheet, Text, View } from '@react-pdf/renderer';
import { formatMoment, formatMoney, type DocumentJob, type DocumentParty } from '@wingstage/shared';

/*
 * The pieces every Wingstage document is made of: the shipped font, an A4 page with the workshop at
 * the top and "Page n of m" at the foot, headings, label/value blocks and tables whose header row
 * repeats on every page they run onto. The documents themselves (invoice.tsx, …) only arrange these.
 */

/** Source Sans 3 (OFL-1.1), full TTFs shipped in the repository: every Latin script renders ("Łódź, Dvořák"). */
const FONT_DIR = fileURLToPath(new URL('../../../assets/fonts/', import.meta.url));
export const FONT = 'Source Sans 3';
Font.register({
  family: FONT,
  fonts: [
    { src: path.join(FONT_DIR, 'SourceSans3-Regular.ttf'), fontWeight: 400 },
    { src: path.join(FONT_DIR, 'SourceSans3-Semibold.ttf'), fontWeight: 600 },
  ],
});
// Words are never split with a hyphen: registrations, part numbers and invoice numbers must read whole.
Font.registerHyphenationCallback((word) => [word]);

export const INK = '#1d232b';
export const MUTED = '#59616b';
export const RULE = '#c9ced4';
export const TINT = '#eef1f4';
export const ACCENT = '#23445e';

export const s = StyleSheet.create({
  page: { fontFamily: FONT, fontSize: 9.5, color: INK, paddingTop: 46, paddingBottom: 54, paddingHorizontal: 44, lineHeight: 1.3 },
  runningHead: { position: 'absolute', top: 20, left: 44, right: 44, flexDirection: 'row', justifyContent: 'space-between', fontSize: 8, color: MUTED },
  foot: {
    position: 'absolute',
    top: 808,
    left: 44,
    right: 44,
    flexDirection: 'row',
    justifyContent: 'space-between',
    fontSize: 8,
    color: MUTED,
    borderTopWidth: 0.5,
    borderTopColor: RULE,
    paddingTop: 5,
  },
  masthead: { flexDirection: 'row', justifyContent: 'space-between', alignItems: 'flex-start', marginBottom: 16 },
  workshopName: { fontSize: 13, fontWeight: 600, color: ACCENT, lineHeight: 1.25, marginBottom: 2 },
  small: { fontSize: 8.5, color: MUTED },
  titleBox: { alignItems: 'flex-end', maxWidth: 220 },
  title: { fontSize: 18, fontWeight: 600, color: INK, lineHeight: 1.2 },
  titleRef: { fontSize: 10.5, color: MUTED, marginTop: 2, lineHeight: 1.3 },
  h2: { fontSize: 11.5, fontWeight: 600, color: ACCENT, marginTop: 14, marginBottom: 5, lineHeight: 1.25 },
  h3: { fontSize: 10, fontWeight: 600, marginTop: 8, marginBottom: 3 },
  para: { marginBottom: 4 },
  strong: { fontWeight: 600 },
  columns: { flexDirection: 'row', gap: 18 },
  column: { flex: 1 },
  facts: { borderTopWidth: 0.75, borderTopColor: INK },
  factRow: { flexDirection: 'row', paddingVertical: 2.5, borderBottomWidth: 0.5, borderBottomColor: RULE },
  factLabel: { width: '42%', color: MUTED },
  factValue: { width: '58%' },
  table: { marginTop: 2, marginBottom: 4 },
  thead: { flexDirection: 'row', borderTopWidth: 0.75, borderTopColor: INK, borderBottomWidth: 0.75, borderBottomColor: INK, backgroundColor: TINT },
  th: { paddingVertical: 3, paddingHorizontal: 3, fontWeight: 600, fontSize: 8.5 },
  tr: { flexDirection: 'row', borderBottomWidth: 0.5, borderBottomColor: RULE },
  td: { paddingVertical: 2.5, paddingHorizontal: 3 },
  groupRow: { flexDirection: 'row', borderBottomWidth: 0.5, borderBottomColor: RULE, paddingVertical: 3, paddingHorizontal: 3 },
  sumRow: { flexDirection: 'row', paddingVertical: 2 },
  note: { fontSize: 8.5, color: MUTED, marginTop: 3 },
  box: { borderWidth: 0.75, borderColor: INK, padding: 7, marginTop: 8 },
  notice: { borderLeftWidth: 3, borderLeftColor: ACCENT, backgroundColor: TINT, paddingVertical: 5, paddingHorizontal: 8, marginTop: 8 },
});

// ---- words for dates and money ----

const DAY = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'long', year: 'numeric', timeZone: 'UTC' });

/** "2026-12-02" → "2 December 2026" (a calendar date: no time zone moves it). */
export function day(iso: string): string {
  const m = /^(\d{4})-(\d{2})-(\d{2})/.exec(iso);
  if (!m) return iso;
  return DAY.format(new Date(Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3]))));
}

/** A moment as the workshop's clock shows it: "2 December 2026 at 14:03 GMT". */
export function moment(at: Date | string): string {
  return formatMoment(at, 'long-zone').replace(', ', ' at ');
}

export const money = (amount: string, currency: string) => formatMoney(amount, currency);

/** "1.50" → "1.5", "2.00" → "2": quantities read as people write them (never a float). */
export function quantity(q: string): string {
  if (!/^-?\d+(\.\d+)?$/.test(q)) return q;
  return q.includes('.') ? q.replace(/0+$/, '').replace(/\.$/, '') : q;
}

// ---- the page ----

export interface Letterhead {
  name: string;
  addressLines: string[];
  postcode: string;
  vatNumber?: string | null;
  phone?: string | null;
  email?: string | null;
}

/** One document: A4 pages, the workshop's letterhead on the first, a running head and "Page n of m" on all. */
export function DocumentFrame(p: { title: string; reference: string; subject: string; letterhead: Letterhead; children: ReactNode }) {
  const { letterhead: w } = p;
  const contact = [w.phone, w.email].filter((x): x is string => Boolean(x && x.trim()));
  return (
    <Document title={`${p.title} ${p.reference}`} subject={p.subject} author={w.name} creator="Wingstage" producer="Wingstage" language="en-GB">
      <Page size="A4" style={s.page} wrap>
        <View style={s.runningHead} fixed render={({ pageNumber }) => (pageNumber > 1 ? <RunningHead text={`${w.name} · ${p.title} ${p.reference}`} /> : null)} />
        <View style={s.foot} fixed>
          <Text>
            {p.title} {p.reference}
          </Text>
          <Text render={({ pageNumber, totalPages }) => `Page ${pageNumber} of ${totalPages}`} />
        </View>
        <View style={s.masthead}>
          <View style={{ maxWidth: 280 }}>
            <Text style={s.workshopName}>{w.name}</Text>
            {[...w.addressLines, w.postcode]
              .filter((x) => x.trim() !== '')
              .map((line, i) => (
                <Text key={i} style={s.small}>
                  {line}
                </Text>
              ))}
            {contact.length > 0 && <Text style={s.small}>{contact.join(' · ')}</Text>}
            {w.vatNumber ? <Text style={s.small}>VAT registration number {w.vatNumber}</Text> : null}
          </View>
          <View style={s.titleBox}>
            <Text style={s.title}>{p.title}</Text>
            <Text style={s.titleRef}>{p.reference}</Text>
          </View>
        </View>
        {p.children}
      </Page>
    </Document>
  );
}

function RunningHead({ text }: { text: string }) {
  return <Text>{text}</Text>;
}

export function H2({ children, minPresenceAhead = 60 }: { children: ReactNode; minPresenceAhead?: number }) {
  // Keeps a heading with what follows it instead of alone at the foot of a page.
  return (
    <Text style={s.h2} minPresenceAhead={minPresenceAhead}>
      {children}
    </Text>
  );
}

export function H3({ children }: { children: ReactNode }) {
  return (
    <Text style={s.h3} minPresenceAhead={40}>
      {children}
    </Text>
  );
}

/** Label / value pairs, one per row. */
export function Facts({ rows }: { rows: [string, ReactNode][] }) {
  return (
    <View style={s.facts}>
      {rows.map(([label, value], i) => (
        <View key={i} style={s.factRow} wrap={false}>
          <Text style={s.factLabel}>{label}</Text>
          {typeof value === 'string' ? <Text style={s.factValue}>{value}</Text> : <View style={s.factValue}>{value}</View>}
        </View>
      ))}
    </View>
  );
}

/** A party (supplier or customer) as an address block. */
export function Party({ heading, name, lines, extra = [] }: { heading: string; name: string; lines: string[]; extra?: string[] }) {
  return (
    <View style={s.column}>
      <Text style={[s.small, { textTransform: 'uppercase', letterSpacing: 0.6, marginBottom: 2 }]}>{heading}</Text>
      <Text style={s.strong}>{name}</Text>
      {lines
        .filter((x) => x.trim() !== '')
        .map((l, i) => (
          <Text key={i}>{l}</Text>
        ))}
      {extra.map((l, i) => (
        <Text key={`x${i}`} style={s.small}>
          {l}
        </Text>
      ))}
    </View>
  );
}

/**
 * The head of a money document: the customer's address on the left; on the right the document's
 * own facts, then the job and the aircraft (and any facts that follow them).
 */
export function CustomerAndFacts({
  heading,
  customer,
  job,
  facts,
  after = [],
  marginTop,
}: {
  heading: string;
  customer: DocumentParty & { email: string | null };
  job: DocumentJob;
  facts: [string, ReactNode][];
  after?: [string, ReactNode][];
  marginTop?: number;
}) {
  return (
    <View style={marginTop === undefined ? s.columns : [s.columns, { marginTop }]}>
      <Party heading={heading} name={customer.name} lines={[...customer.addressLines, customer.postcode]} extra={customer.email ? [customer.email] : []} />
      <View style={s.column}>
        <Facts rows={[...facts, ['Job', `${job.number} · ${job.title}`], ['Aircraft', `${job.registration} · ${job.aircraft}`], ...after]} />
      </View>
    </View>
  );
}

/**
 * The opening of a VAT document (invoice, credit note): the frame with the supplier's letterhead, and
 * the customer beside the document's own facts. The rest of the document comes as children.
 */
export function VatDocumentFrame(p: {
  title: string;
  reference: string;
  subject: string;
  supplier: Letterhead;
  heading: string;
  customer: DocumentParty & { email: string | null };
  job: DocumentJob;
  facts: [string, ReactNode][];
  children: ReactNode;
}) {
  return (
    <DocumentFrame title={p.title} reference={p.reference} subject={p.subject} letterhead={{ ...p.supplier }}>
      <CustomerAndFacts heading={p.heading} customer={p.customer} job={p.job} facts={p.facts} />
      {p.children}
    </DocumentFrame>
  );
}

// ---- tables ----

export interface Column {
  label: string;
  /** Share of the row's width (flex grow). */
  flex: number;
  align?: 'left' | 'right';
}

export type Cell = string | { text: string; sub?: string | null; strong?: boolean };

export type Row = { cells: Cell[]; kind?: 'line' | 'sum' } | { group: string; note?: string };

/**
 * A table whose header row repeats at the top of every page it runs onto (a fixed child of the
 * table), and whose rows never split across a page.
 */
export function Table({ columns, rows, empty }: { columns: Column[]; rows: Row[]; empty?: string }) {
  const cell = (c: Cell, col: Column, key: number, sum: boolean) => {
    const v = typeof c === 'string' ? { text: c } : c;
    // A plain cell is one Text node: long tables are most of a document's layout time.
    if (!v.sub) return <Text key={key} style={[s.td, { flex: col.flex, flexBasis: 0, textAlign: col.align ?? 'left' }, v.strong || sum ? s.strong : {}]}>{v.text}</Text>;
    return (
      <View key={key} style={[s.td, { flex: col.flex, flexBasis: 0 }]}>
        <Text style={[{ textAlign: col.align ?? 'left' }, v.strong || sum ? s.strong : {}]}>{v.text}</Text>
        {v.sub ? <Text style={[s.small, { textAlign: col.align ?? 'left' }]}>{v.sub}</Text> : null}
      </View>
    );
  };
  return (
    <View style={s.table}>
      <View style={s.thead} fixed>
        {columns.map((c, i) => (
          <Text key={i} style={[s.th, { flex: c.flex, flexBasis: 0, textAlign: c.align ?? 'left' }]}>
            {c.label}
          </Text>
        ))}
      </View>
      {rows.length === 0 && empty ? (
        <View style={s.tr}>
          <Text style={[s.td, s.small]}>{empty}</Text>
        </View>
      ) : null}
      {rows.map((r, i) =>
        'group' in r ? (
          <View key={i} style={s.groupRow} wrap={false} minPresenceAhead={20}>
            <Text style={s.strong}>{r.group}</Text>
            {r.note ? <Text style={[s.small, { marginLeft: 6, paddingTop: 0.5 }]}>{r.note}</Text> : null}
          </View>
        ) : (
          <View key={i} style={[s.tr, r.kind === 'sum' ? { borderBottomColor: INK, backgroundColor: TINT } : {}]} wrap={false}>
            {r.cells.map((c, j) => cell(c, columns[j]!, j, r.kind === 'sum'))}
          </View>
        ),
      )}
    </View>
  );
}

/** Right-aligned totals: label and amount, the last one (or any marked) in bold above a rule. */
export function Sums({ rows, width = 250 }: { rows: { label: string; value: string; strong?: boolean; note?: string }[]; width?: number }) {
  return (
    <View style={{ alignSelf: 'flex-end', width, marginTop: 4 }} wrap={false}>
      {rows.map((r, i) => (
        <View key={i} style={[s.sumRow, r.strong ? { borderTopWidth: 0.75, borderTopColor: INK, marginTop: 2, paddingTop: 3 } : {}]}>
          <View style={{ flex: 1 }}>
            <Text style={r.strong ? s.strong : {}}>{r.label}</Text>
            {r.note ? <Text style={s.small}>{r.note}</Text> : null}
          </View>
          <Text style={[{ textAlign: 'right', width: 95 }, r.strong ? s.strong : {}]}>{r.value}</Text>
        </View>
      ))}
    </View>
  );
}

export function Notice({ children }: { children: ReactNode }) {
  return (
    <View style={s.notice} wrap={false}>
      {children}
    </View>
  );
}

type TextStyle = ComponentProps<typeof View>['style'];

export function P({ children, style }: { children: ReactNode; style?: TextStyle }) {
  return <Text style={style ? [s.para, style] as TextStyle : s.para}>{children}</Text>;
}

/** Where Wingstage stands: it records; the people and documents named decide. Printed on estimates and decision records. */
export const RECORD_NOT_VERDICT =
  'Wingstage records the work, the prices and the decisions. Whether the aircraft is fit to fly is decided by the licensed inspector, following the manufacturer’s data and the rules of the aviation authority, not by this document.';
