/**
 * `npm run calibrate [-- --json] [-- --workers N]`: the calibration study of the fitter's intervals,
 * model choice, two-node recoveries and solar term, on invented logs from the reference simulator
 * (scenarios.ts; tests/support/zone-sim.ts). Prints for τ and h the coverage of the 95 % intervals and
 * their median relative width; how often one node is kept on one-node truths; how often two nodes are
 * chosen on two-node truths and the error of the recovery time after a night setback against the RK4
 * truth (truth.ts); and the τ and h errors with and without the solar proxy. Cases run on worker
 * threads (one per core by default).
 */
import os from 'node:os';
import { Worker } from 'node:worker_threads';
import { studyScenarios } from './scenarios.ts';
import type { CaseSummary, Estimate } from './analyse.ts';

const args = process.argv.slice(2);
const json = args.includes('--json');
const wArg = args.indexOf('--workers');
const workers = Math.max(1, wArg >= 0 ? Number(args[wArg + 1]) : Math.min(os.availableParallelism?.() ?? os.cpus().length, 8));

const median = (xs: number[]) => {
  if (xs.length === 0) return NaN;
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : 0.5 * (s[m - 1]! + s[m]!);
};
const covered = (e: Estimate) => e.lo <= e.truth && e.truth <= e.hi;
const width = (e: Estimate) => (e.hi - e.lo) / e.truth;

async function runAll(): Promise<CaseSummary[]> {
  const ids = studyScenarios().map((s) => s.id);
  const results: CaseSummary[] = [];
  let next = 0;
  await Promise.all(
    Array.from({ length: Math.min(workers, ids.length) }, () => new Promise<void>((resolve, reject) => {
      const w = new Worker(new URL('./worker.mjs', import.meta.url));
      const send = () => w.postMessage(next < ids.length ? ids[next++]! : null);
      w.on('message', (m: 'ready' | { id: string; result?: CaseSummary; error?: string }) => {
        if (m !== 'ready') {
          if (m.result) results.push(m.result);
          else results.push({ id: m.id, group: 'coverage', format: '', model: null, error: m.error ?? 'failed', seconds: 0 });
          if (!json && process.stderr.isTTY) process.stderr.write(`\r${results.length}/${ids.length} cases`);
        }
        send();
      });
      w.on('error', reject);
      w.on('exit', () => resolve());
    })),
  );
  if (!json && process.stderr.isTTY) process.stderr.write('\n');
  const order = new Map(ids.map((id, i) => [id, i]));
  return results.sort((a, b) => order.get(a.id)! - order.get(b.id)!);
}

const started = performance.now();
const cases = await runAll();
const seconds = (performance.now() - started) / 1000;

const cov = cases.filter((c) => c.group === 'coverage' && c.tau && c.h);
const mass = cases.filter((c) => c.group === 'mass' && c.recovery);
const solar = cases.filter((c) => c.group === 'solar' && c.solar);
const recErr = mass
  .filter((c) => c.recovery!.trueHours !== null && c.recovery!.predictedHours !== null)
  .map((c) => ({ two: c.recovery!.predictedHours! / c.recovery!.trueHours! - 1, one: c.recovery!.oneNodeHours === null ? NaN : c.recovery!.oneNodeHours / c.recovery!.trueHours! - 1 }));
const summary = {
  seconds: Number(seconds.toFixed(1)),
  workers,
  coverage: {
    cases: cov.length,
    failed: cases.filter((c) => c.group === 'coverage').length - cov.length,
    tauCoverage: cov.filter((c) => covered(c.tau!)).length / cov.length,
    heatRateCoverage: cov.filter((c) => covered(c.h!)).length / cov.length,
    tauMedianRelativeWidth: median(cov.map((c) => width(c.tau!))),
    heatRateMedianRelativeWidth: median(cov.map((c) => width(c.h!))),
    oneNodeKept: cov.filter((c) => c.model === 'one-node').length / cov.length,
    searchSkipped: cov.filter((c) => c.searchSkipped).length,
  },
  mass: {
    cases: mass.length,
    twoNodeChosen: mass.filter((c) => c.model === 'two-node').length / Math.max(1, mass.length),
    searchSkipped: mass.filter((c) => c.searchSkipped).length,
    tauEffCoverage: mass.filter((c) => covered(c.tau!)).length / Math.max(1, mass.length),
    heatRateCoverage: mass.filter((c) => covered(c.h!)).length / Math.max(1, mass.length),
    recoveryCases: recErr.length,
    recoveryWithin10Percent: recErr.filter((e) => Math.abs(e.two) <= 0.1).length / Math.max(1, recErr.length),
    recoveryMedianAbsErrorPercent: 100 * median(recErr.map((e) => Math.abs(e.two))),
    recoveryMaxAbsErrorPercent: 100 * Math.max(...recErr.map((e) => Math.abs(e.two))),
    oneNodeRecoveryMedianAbsErrorPercent: 100 * median(recErr.map((e) => Math.abs(e.one)).filter(Number.isFinite)),
  },
  solar: {
    cases: solar.length,
    tauMedianErrorPercentWith: 100 * median(solar.map((c) => c.solar!.tauWith)),
    tauMedianErrorPercentWithout: 100 * median(solar.map((c) => c.solar!.tauWithout)),
    heatRateMedianErrorPercentWith: 100 * median(solar.map((c) => c.solar!.hWith)),
    heatRateMedianErrorPercentWithout: 100 * median(solar.map((c) => c.solar!.hWithout)),
  },
  errors: cases.filter((c) => c.error).map((c) => `${c.id}: ${c.error}`),
};

if (json) {
  process.stdout.write(JSON.stringify({ ...summary, cases }, null, 2) + '\n');
} else {
  const pct = (x: number) => `${(100 * x).toFixed(0)} %`;
  const c = summary.coverage, m = summary.mass, s = summary.solar;
  console.log(`Calibration study: ${cases.length} invented logs (28 days each), ${summary.seconds} s on ${workers} worker${workers > 1 ? 's' : ''}`);
  console.log('');
  console.log(`One-node truths (${c.cases}; τ 10–80 h, 5/10/15 min, 1 °F / 0.5 °C, seconds/percent/on-off runtime):`);
  console.log(`  τ: 95 % interval holds the truth in ${pct(c.tauCoverage)} (goal 88–98 %), median width ${pct(c.tauMedianRelativeWidth)} of τ`);
  console.log(`  h: 95 % interval holds the truth in ${pct(c.heatRateCoverage)} (goal 88–98 %), median width ${pct(c.heatRateMedianRelativeWidth)} of h`);
  console.log(`  one node kept by the model choice in ${pct(c.oneNodeKept)} (goal ≥ 90 %); the two-node search was skipped by the rounding bound in ${c.searchSkipped} of ${c.cases}`);
  console.log(`Two-node truths (${m.cases}; air–mass 1–5 h, mass–outdoor 30–100 h):`);
  console.log(`  two nodes chosen in ${pct(m.twoNodeChosen)} (search skipped by the rounding bound in ${m.searchSkipped}); C·R_total interval holds the truth in ${pct(m.tauEffCoverage)}, h in ${pct(m.heatRateCoverage)}`);
  console.log(`  recovery after a 5 K night setback: within 10 % of the RK4 truth in ${pct(m.recoveryWithin10Percent)} of ${m.recoveryCases}; median error ${m.recoveryMedianAbsErrorPercent.toFixed(1)} %, worst ${m.recoveryMaxAbsErrorPercent.toFixed(1)} % (one node forced: median ${m.oneNodeRecoveryMedianAbsErrorPercent.toFixed(1)} %)`);
  console.log(`Sunny zones (${s.cases}): median error of τ ${s.tauMedianErrorPercentWith.toFixed(1)} % with the solar proxy, ${s.tauMedianErrorPercentWithout.toFixed(1)} % without; of h ${s.heatRateMedianErrorPercentWith.toFixed(1)} % with, ${s.heatRateMedianErrorPercentWithout.toFixed(1)} % without`);
  if (summary.errors.length) console.log(`Failed fits: ${summary.errors.join('; ')}`);
}
