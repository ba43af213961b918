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

// Inclusive time (the function and everything it called), counted once per sample even when the
// function recurses: where a middleware's whole cost shows, e.g. pino-http's finish handler.
const parent = new Map();
for (const n of prof.nodes) for (const c of n.children ?? []) parent.set(c, n.id);
const incl = new Map();
for (const [id, us] of self) {
  const seen = new Set();
  for (let at = id; at !== undefined; at = parent.get(at)) {
    const cf = byId.get(at).callFrame;
    if (!cf.url) continue;
    const key = `${cf.functionName || '(anonymous)'}  ${pkgOf(cf.url)}:${cf.lineNumber + 1}`;
    if (seen.has(key)) continue;
    seen.add(key);
    incl.set(key, (incl.get(key) ?? 0) + us);
  }
}
console.log('\ninclusive time by function (outside node core):');
for (const [k, v] of [...incl].filter(([k]) => !k.includes('node core')).sort((a, b) => b[1] - a[1]).slice(0, top * 2)) console.log(`${pct(v)}  ${k}`);
