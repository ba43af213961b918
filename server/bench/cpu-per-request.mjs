// CPU per request of a running server, read from the kernel's account of its process (user + system
// time in /proc/<pid>/stat) around a fixed number of requests: steadier on a loaded machine than
// throughput, which moves with whatever else runs. Linux only.
//   node server/bench/cpu-per-request.mjs <pid> <url> [requests=4000] [connections=8] [cookie]
// Run it against the app and the bare baseline with the same numbers and compare the two.
import { readFileSync } from 'node:fs';
import os from 'node:os';
import autocannon from 'autocannon';

const [pid, url, amountArg, connArg, cookie] = process.argv.slice(2);
if (!pid || !url) throw new Error('usage: cpu-per-request.mjs <pid> <url> [requests] [connections] [cookie]');
const amount = Number(amountArg ?? 4000);
const connections = Number(connArg ?? 8);
const headers = { 'accept-encoding': 'gzip, deflate, br', accept: 'application/json', ...(cookie ? { cookie } : {}) };

// Fields 14 and 15 of /proc/<pid>/stat (after the command name in parentheses): utime, stime in ticks.
const TICK_MS = 10;
function cpuMs() {
  const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
  const rest = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
  return (Number(rest[11]) + Number(rest[12])) * TICK_MS;
}

const run = (n) =>
  new Promise((resolve, reject) => {
    autocannon({ url, amount: n, connections, headers }, (err, r) => (err ? reject(err) : resolve(r)));
  });

await run(Math.min(500, amount)); // warm: JIT, pooled connections, prepared statements
const before = cpuMs();
const r = await run(amount);
const used = cpuMs() - before;
const bad = r.non2xx + r.errors + r.timeouts;
console.log(
  `${url}: ${(used / r.requests.total).toFixed(3)} ms CPU per request (${used} ms over ${r.requests.total} requests, ${connections} connections` +
    `${bad ? `, ${bad} errors` : ''}; load ${os.loadavg()[0].toFixed(1)})`,
);
