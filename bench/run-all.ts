/**
 * The benchmark suite in one command: `pnpm bench` (add `-- --quick` for a run of about a
 * minute; the default run takes about five on an idle 2-core machine).
 *
 * Each suite runs in a fresh Node.js process (so that one suite's compiled code and heap
 * do not affect another's) with --expose-gc, and reports figures measured within its own
 * run; this script prints them as one dated table with PASS/MISS beside each target.
 * Suites: sampler overhead per leapfrog step; gradient cost of the shipped models
 * against a hand-written fused float64 limit, by N; NUTS against adaptive Metropolis;
 * scaling with dimension; memory of long runs; parallel chains.
 *
 * Run one suite alone: npx tsx --conditions=source bench/suite-<name>.ts [--quick]
 * Options: --quick, --only=overhead,gradient,… (a comma-separated subset).
 */
import { cpus, loadavg } from 'node:os';
import { fileURLToPath } from 'node:url';
import { runChild } from './support/childRun.js';
import { figureTable, verdict, type SuiteResult } from './support/figures.js';

const suites = ['overhead', 'gradient', 'baseline', 'scaling', 'memory', 'parallel'] as const;

async function main(): Promise<void> {
  const quick = process.argv.includes('--quick');
  const only = process.argv.find((a) => a.startsWith('--only='))?.slice('--only='.length).split(',');
  const chosen = suites.filter((s) => only === undefined || only.includes(s));
  const started = performance.now();
  const load = (): string => loadavg().map((x) => x.toFixed(2)).join(', ');
  const header = [
    `apsis benchmark suite, ${new Date().toISOString().slice(0, 16).replace('T', ' ')} UTC${quick ? ' (--quick)' : ''}`,
    `node ${process.version}, ${cpus().length} cores (${cpus()[0]?.model ?? 'unknown'}), load average before: ${load()}`,
  ];
  console.log(header.join('\n'));
  const results: SuiteResult[] = [];
  for (const name of chosen) {
    const file = fileURLToPath(new URL(`./suite-${name}.ts`, import.meta.url));
    process.stdout.write(`running ${name}… `);
    const r = await runChild<SuiteResult>(file, ['--json', ...(quick ? ['--quick'] : [])]);
    console.log(`${r.seconds.toFixed(1)} s`);
    results.push(r);
  }
  console.log('');
  console.log(figureTable(results));
  for (const r of results) {
    if (r.details.length === 0) continue;
    console.log('');
    for (const d of r.details) console.log(d);
  }
  const figures = results.flatMap((r) => r.figures);
  const targets = figures.filter((f) => f.target);
  const passed = targets.filter((f) => verdict(f) === 'PASS').length;
  console.log('');
  console.log(`${passed} of ${targets.length} targets met; total ${((performance.now() - started) / 1000).toFixed(0)} s; load average after: ${load()}`);
}

await main();
