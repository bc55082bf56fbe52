/**
 * Cost of a full diagnostics pass: the summary (mean, sd, median, 5/50/95% quantiles, MCSE
 * of the mean, bulk-ESS, tail-ESS, rank-normalised split R-hat) of every quantity of a
 * trace of 4 chains x 1e5 draws x 50 quantities, laid out as a sampling run returns it
 * (one row-major draws x dim Float64Array per chain).
 *
 * Run: npx tsx --conditions=source bench/diagnostics-pass.ts [--draws N] [--dim D] [--chains M] [--repeats R]
 * Prints seconds for the pass and per quantity; `measureDiagnosticsPass` returns the
 * figures so a combined benchmark can print them beside a sampling run's cost.
 *
 * The synthetic quantities are AR(1) series (autocorrelation phi^t) with phi spread over
 * [0, 0.95] across columns, so both the direct-lag and the FFT routes of the ESS are timed.
 */
import { summarizeDraws } from '@apsis/diagnostics';
import { pathToFileURL } from 'node:url';

export interface DiagnosticsPassFigures {
  readonly chains: number;
  readonly draws: number;
  readonly dim: number;
  /** Best of the repeats, wall-clock seconds for the whole pass. */
  readonly seconds: number;
  /** seconds / dim. */
  readonly secondsPerQuantity: number;
  /** Process CPU seconds (user + system) of the best repeat: less sensitive to other jobs on the machine. */
  readonly cpuSeconds: number;
  readonly repeats: number;
}

/** Small seeded generator for the synthetic trace (xorshift32 + Box–Muller). */
function normalStream(seed: number): () => number {
  let s = seed >>> 0 || 1;
  const uniform = (): number => {
    s ^= s << 13;
    s >>>= 0;
    s ^= s >>> 17;
    s ^= s << 5;
    s >>>= 0;
    return (s + 0.5) / 4294967296;
  };
  return () => Math.sqrt(-2 * Math.log(uniform())) * Math.cos(2 * Math.PI * uniform());
}

/** Synthetic trace: per chain a draws x dim row-major matrix of AR(1) columns. */
export function syntheticTrace(chains: number, draws: number, dim: number, seed = 2024): Float64Array[] {
  const out: Float64Array[] = [];
  for (let c = 0; c < chains; c++) {
    const normal = normalStream(seed + 7919 * c);
    const m = new Float64Array(draws * dim);
    for (let j = 0; j < dim; j++) {
      const phi = (0.95 * j) / Math.max(1, dim - 1);
      const innovation = Math.sqrt(1 - phi * phi);
      let x = normal();
      for (let i = 0; i < draws; i++) {
        if (i > 0) x = phi * x + innovation * normal();
        m[i * dim + j] = 10 * j + x;
      }
    }
    out.push(m);
  }
  return out;
}

export function measureDiagnosticsPass(chains = 4, draws = 100_000, dim = 50, repeats = 2): DiagnosticsPassFigures {
  const trace = syntheticTrace(chains, draws, dim);
  let best = Infinity;
  let cpu = Infinity;
  for (let r = 0; r < repeats; r++) {
    const cpuStart = process.cpuUsage();
    const start = process.hrtime.bigint();
    const table = summarizeDraws(trace, { dim });
    const seconds = Number(process.hrtime.bigint() - start) / 1e9;
    const used = process.cpuUsage(cpuStart);
    if (table.rows.length !== dim) throw new Error('summary lost rows');
    if (seconds < best) {
      best = seconds;
      cpu = (used.user + used.system) / 1e6;
    }
  }
  return { chains, draws, dim, seconds: best, secondsPerQuantity: best / dim, cpuSeconds: cpu, repeats };
}

function argument(name: string, fallback: number): number {
  const i = process.argv.indexOf(`--${name}`);
  return i >= 0 && i + 1 < process.argv.length ? Number(process.argv[i + 1]) : fallback;
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const f = measureDiagnosticsPass(argument('chains', 4), argument('draws', 100_000), argument('dim', 50), argument('repeats', 2));
  console.log(`diagnostics pass: ${f.chains} chains x ${f.draws} draws x ${f.dim} quantities`);
  console.log(`  full summary: ${f.seconds.toFixed(2)} s wall, ${f.cpuSeconds.toFixed(2)} s CPU (best of ${f.repeats})`);
  console.log(`  per quantity: ${(1000 * f.secondsPerQuantity).toFixed(1)} ms`);
  console.log(`  per draw and quantity: ${((1e9 * f.seconds) / (f.chains * f.draws * f.dim)).toFixed(1)} ns`);
}
