/** Entry of the `apsis` command (loaded by bin/apsis.mjs). */
import { runCli } from './runCli.js';

const controller = new AbortController();
let interrupts = 0;
process.on('SIGINT', () => {
  interrupts += 1;
  if (interrupts > 1) process.exit(130);
  controller.abort(new Error('interrupted'));
});

const status = await runCli(process.argv.slice(2), {
  stdout: process.stdout,
  stderr: process.stderr,
  cwd: process.cwd(),
  env: process.env,
  signal: controller.signal,
});
process.exitCode = status;
