/**
 * Pricing benchmark: `npm run bench` (from the root or shared/). Prices a 1,000-line estimate with
 * 20 access tasks and 3 VAT rates, and a 50-line estimate, and prints the median and 95th-percentile
 * time per estimate. A measurement, not a test: it never fails the build.
 */
import { performance } from 'node:perf_hooks';
import os from 'node:os';
import { clearParsedDecimals, formatMoney, priceEstimate, VAT_ROUNDING_METHODS, type EstimateInput, type EstimateLineInput, type WorkshopPricing } from '../src/index.js';

const pricing: WorkshopPricing = {
  currency: 'GBP',
  vatRounding: 'invoice-nearest',
  vatRates: { standard: '20', reduced: '5', zero: '0' },
  partsMarkupPercent: '20',
  subcontractMarkupPercent: '10',
};

/** A deterministic pseudo-random sequence so every run prices the same estimate. */
function rng(seed: number) {
  let s = seed >>> 0;
  return () => {
    s = (s * 1664525 + 1013904223) >>> 0;
    return s / 4294967296;
  };
}

function buildEstimate(lineCount: number, accessCount: number, seed: number): EstimateInput {
  const r = rng(seed);
  const pick = <T>(xs: readonly T[]) => xs[Math.floor(r() * xs.length)]!;
  // Whole pence first, then written as text: the amounts never exist as fractional numbers.
  const money = (maxPounds: number) => {
    const pence = Math.floor(r() * maxPounds * 100);
    return `${Math.floor(pence / 100)}.${String(pence % 100).padStart(2, '0')}`;
  };
  const stages = ['inspection', 'discovered', 'approved', 'declined'] as const;
  const rates = ['standard', 'reduced', 'zero'] as const;
  const accessTasks = Array.from({ length: accessCount }, (_, i) => ({
    id: `A${i}`,
    hours: pick(['0.5', '1', '1.5', '2.25', '4']),
    ratePerHour: '62.50',
    vatRate: 'standard' as const,
  }));
  const lines: EstimateLineInput[] = Array.from({ length: lineCount }, (_, i) => {
    const common = {
      id: `L${i}`,
      stage: pick(stages),
      vatRate: pick(rates),
      findingId: r() < 0.7 ? `F${Math.floor(r() * lineCount / 4)}` : null,
      accessTaskId: accessCount > 0 && r() < 0.4 ? `A${Math.floor(r() * accessCount)}` : null,
      discount: r() < 0.1 ? { percent: '10' } : null,
    };
    switch (Math.floor(r() * 4)) {
      case 0:
        return { ...common, kind: 'labour', hours: pick(['0.25', '0.5', '1', '1.75', '3']), ratePerHour: '62.50' };
      case 1:
        return r() < 0.8
          ? { ...common, kind: 'part', quantity: pick(['1', '2', '4', '0.5']), unitCost: money(300) }
          : { ...common, kind: 'part', quantity: '1', unitPrice: money(500) };
      case 2:
        return { ...common, kind: 'subcontract', cost: money(1500) };
      default:
        return { ...common, kind: 'fee', amount: money(80) };
    }
  });
  return { lines, accessTasks };
}

/**
 * Wall-clock time per estimate, and the CPU time the process spent on it (process.cpuUsage). On a
 * machine shared with other work the wall clock includes time spent waiting for a core; the CPU
 * figure is what the engine itself costs.
 */
function measure(label: string, input: EstimateInput, p: WorkshopPricing, iterations: number, warmup: number) {
  for (let i = 0; i < warmup; i++) priceEstimate(input, p);
  // Each run starts with an empty parse cache, as a server pricing a new estimate would: the
  // figures are not flattered by the bench pricing the same strings again and again.
  clearParsedDecimals();
  const wall: number[] = [];
  const cpu: number[] = [];
  for (let i = 0; i < iterations; i++) {
    clearParsedDecimals();
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    priceEstimate(input, p);
    const t1 = performance.now();
    const c = process.cpuUsage(c0);
    wall.push(t1 - t0);
    cpu.push((c.user + c.system) / 1000);
  }
  const q = (xs: number[], f: number) => {
    const s = [...xs].sort((a, b) => a - b);
    return s[Math.min(s.length - 1, Math.floor(f * s.length))]!;
  };
  return { label, rounding: p.vatRounding, iterations, median: q(wall, 0.5), p95: q(wall, 0.95), min: q(wall, 0), cpuMedian: q(cpu, 0.5) };
}

const big = buildEstimate(1000, 20, 42);
const small = buildEstimate(50, 3, 7);
const check = priceEstimate(big, pricing);
const usedRates = new Set(big.lines.map((l) => l.vatRate));

console.log(`Wingstage pricing bench — node ${process.version}, ${os.cpus()[0]?.model ?? 'cpu'} × ${os.cpus().length}`);
console.log(
  `1,000-line estimate: ${big.lines.length} lines, ${big.accessTasks!.length} access tasks, ${usedRates.size} VAT rates, ${check.findings.length} findings; committed gross ${formatMoney(check.committed.gross, pricing.currency)}`,
);
const rows: ReturnType<typeof measure>[] = [];
// BENCH_METHODS=invoice-nearest,line-nearest narrows the run while tuning.
const methods = process.env.BENCH_METHODS ? VAT_ROUNDING_METHODS.filter((m) => process.env.BENCH_METHODS!.split(',').includes(m)) : VAT_ROUNDING_METHODS;
for (const rounding of methods) {
  const p = { ...pricing, vatRounding: rounding };
  rows.push(measure('1,000 lines', big, p, 300, 50));
  rows.push(measure('50 lines', small, p, 3000, 300));
}
console.log(`load average (1/5/15 min): ${os.loadavg().map((x) => x.toFixed(1)).join(' / ')} on ${os.cpus().length} cores`);
console.log('estimate      rounding          wall median ms   p95 ms    min ms   cpu median ms   runs');
for (const r of rows) {
  console.log(
    `${r.label.padEnd(13)} ${r.rounding.padEnd(17)} ${r.median.toFixed(3).padStart(14)} ${r.p95.toFixed(3).padStart(8)} ${r.min.toFixed(3).padStart(9)} ${r.cpuMedian.toFixed(3).padStart(15)} ${String(r.iterations).padStart(6)}`,
  );
}
const worst = (label: string, key: 'median' | 'cpuMedian') => Math.max(...rows.filter((r) => r.label === label).map((r) => r[key]));
console.log(
  `goal: 1,000 lines < 10 ms median — worst method wall ${worst('1,000 lines', 'median').toFixed(3)} ms, cpu ${worst('1,000 lines', 'cpuMedian').toFixed(3)} ms; ` +
    `50 lines < 0.5 ms — worst wall ${worst('50 lines', 'median').toFixed(3)} ms, cpu ${worst('50 lines', 'cpuMedian').toFixed(3)} ms`,
);
