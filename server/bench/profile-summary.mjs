// Where the time went in a V8 CPU profile (node --cpu-prof): self time by function and by package.
//   node server/bench/profile-summary.mjs .local/bench/cpu-prof/CPU….cpuprofile [top]
import { readFileSync } from 'node:fs';

const file = process.argv[2];
const top = Number(process.argv[3] ?? 25);
const prof = JSON.parse(readFileSync(file, 'utf8'));
const byId = new Map(prof.nodes.map((n) => [n.id, n]));
const self = new Map();
const dt = prof.timeDeltas;
for (let i = 0; i < prof.samples.length; i += 1) self.set(prof.samples[i], (self.get(prof.samples[i]) ?? 0) + (dt[i] ?? 0));
const total = [...self.values()].reduce((a, b) => a + b, 0);

const pkgOf = (url) => {
  if (!url) return '(native/idle)';
  const m = /node_modules\/((?:@[^/]+\/)?[^/]+)/.exec(url);
  if (m) return m[1];
  if (url.startsWith('node:')) return 'node core';
  const w = /wt-[^/]+\/(server|shared|client)\/src\/([^/]+)/.exec(url);
  return w ? `${w[1]}/${w[2]}` : url.replace(/^file:\/\//, '').slice(-40);
};
const fnTotals = new Map();
const pkgTotals = new Map();
for (const [id, us] of self) {
  const n = byId.get(id);
  const cf = n.callFrame;
  const key = `${cf.functionName || '(anonymous)'}  ${pkgOf(cf.url)}:${cf.lineNumber + 1}`;
  fnTotals.set(key, (fnTotals.get(key) ?? 0) + us);
  const pkg = cf.url ? pkgOf(cf.url) : cf.functionName;
  pkgTotals.set(pkg, (pkgTotals.get(pkg) ?? 0) + us);
}
const pct = (us) => `${((us / total) * 100).toFixed(1).padStart(5)}%`;
console.log(`profile ${file}: ${(total / 1e6).toFixed(1)} s sampled\n\nself time by package or area:`);
for (const [k, v] of [...pkgTotals].sort((a, b) => b[1] - a[1]).slice(0, top)) console.log(`${pct(v)}  ${k}`);
console.log('\nself time by function:');
for (const [k, v] of [...fnTotals].sort((a, b) => b[1] - a[1]).slice(0, top)) console.log(`${pct(v)}  ${k}`);
