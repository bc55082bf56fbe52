/**
 * Runs a benchmark script in a fresh Node.js process (sources through tsx, the `source`
 * export condition, `--expose-gc`) and returns the JSON it prints on a line starting with
 * `marker`. A fresh process per measurement keeps one model's optimised code from being
 * made polymorphic by another's, and gives memory figures a clean heap.
 */
import { spawn } from 'node:child_process';

/** Runs `node --expose-gc --conditions=source --import tsx <script> ...args` and parses its marked line. */
export async function runChild<T>(script: string, args: readonly string[], marker = 'APSIS-BENCH'): Promise<T> {
  const child = spawn(process.execPath, ['--expose-gc', '--conditions=source', '--import', 'tsx', script, ...args], {
    stdio: ['ignore', 'pipe', 'pipe'],
    env: { ...process.env, APSIS_QUIET: '1' },
  });
  let out = '';
  let err = '';
  child.stdout.setEncoding('utf8').on('data', (d: string) => (out += d));
  child.stderr.setEncoding('utf8').on('data', (d: string) => (err += d));
  const code = await new Promise<number | null>((resolve) => child.on('close', resolve));
  const line = out.split('\n').find((l) => l.startsWith(`${marker} `));
  if (code !== 0 || line === undefined) {
    throw new Error(`${script} ${args.join(' ')} failed (exit ${code}):\n${err.slice(-2000)}${out.slice(-1000)}`);
  }
  return JSON.parse(line.slice(marker.length + 1)) as T;
}
