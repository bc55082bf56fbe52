/**
 * The apsis demo: a joint radial-velocity + transit fit of an invented star with two
 * planets, sampled with NUTS; prints the parameter table with derived quantities and
 * the convergence verdict, and writes an HTML report.
 *
 *   pnpm demo        (tsx --conditions=source examples/demo.ts)
 *
 * The scenario is in examples/demo/scenario.ts; the steps are in examples/demo/runDemo.ts.
 */
import { pathToFileURL } from 'node:url';
import { main } from './demo/runDemo.js';

export { main, DemoOptionsError, DEMO_RUN_LABEL, type DemoOptions, type DemoResult } from './demo/runDemo.js';

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  await main();
}
