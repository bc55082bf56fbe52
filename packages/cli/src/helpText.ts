/** Text of `apsis --help` and of each command's `--help`. */
export const helpText: Record<'main' | 'summary' | 'resume' | 'report', string> = {
  main: `apsis: read, check, continue and report MCMC run folders.

Usage:
  apsis summary <run folder> [--json] [--all] [--rhat X] [--ess-per-chain N] [--strict]
  apsis resume  <run folder> [--module PATH] [--export NAME] [--threads N] [--quiet]
  apsis report  <run folder> [--out DIR] [--title TEXT]
  apsis --help | apsis <command> --help | apsis --version

Exit status: 0 done (summary: no convergence check failed), 1 summary: a
convergence check failed, 2 usage error or unusable run folder, 130 interrupted.
`,
  summary: `apsis summary <run folder> [options]

Prints the run, the summary table (mean, sd, quantiles, MC error, bulk and tail
ESS, R-hat), sampler health and warnings, and a convergence verdict. Exits 1
when a check fails, so scripts and CI can gate on it.

Options:
  --json               one JSON object on stdout instead of text
  --all                also summarise the unconstrained coordinates (default:
                       the outputs when the run has them, else the coordinates)
  --rhat X             R-hat above X fails (default 1.01)
  --ess-per-chain N    bulk or tail ESS below N x chains fails (default 100)
  --strict             cautions fail too (tree-depth saturation, truncated chains)
`,
  resume: `apsis resume <run folder> [options]

Continues an interrupted run from its newest usable checkpoint; the draws are
exactly those of an uninterrupted run. A run folder is not trusted to choose code:
unless the run's target comes from an apsis package, name its module yourself.

Options:
  --module PATH        module that builds the target (its export name and JSON
                       arguments are taken from the run folder)
  --export NAME        use this export of the module instead
  --threads N          worker threads (0: this thread; default: one per core,
                       at most one per chain)
  --quiet              no progress display
`,
  report: `apsis report <run folder> [options]

Writes a self-contained HTML report (traces, ranks, pairs, summary, warnings)
of the run.

Options:
  --out DIR            folder for report.html (default: the run folder)
  --title TEXT         report title (default: the run's label or folder name)
`,
};
