import { ROLE_LABELS } from '@wingstage/shared';
import { demoSignIns } from '../../../db/seeders/demo-data.js';

// Printed from the same data the seed uses, so nobody copies the table by hand.
const rows = demoSignIns().map((r) => [ROLE_LABELS[r.role], r.name, r.email, r.password]);
const head = ['Role', 'Name', 'E-mail', 'Password'];
const widths = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i]!.length)));
const line = (cells: string[]) => `| ${cells.map((c, i) => c.padEnd(widths[i]!)).join(' | ')} |`;
console.log(line(head));
console.log(`|${widths.map((w) => '-'.repeat(w + 2)).join('|')}|`);
for (const r of rows) console.log(line(r));
