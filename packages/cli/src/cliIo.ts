/** Where the command line reads and writes; `process` in real use, buffers in tests. */
export interface CliIo {
  readonly stdout: { write(text: string): unknown; readonly isTTY?: boolean };
  readonly stderr: { write(text: string): unknown; readonly isTTY?: boolean; readonly columns?: number };
  /** Directory relative paths are resolved against. */
  readonly cwd: string;
  readonly env: NodeJS.ProcessEnv;
  /** Aborts a running `resume` (Ctrl-C). */
  readonly signal?: AbortSignal;
}

/** Exit statuses of `apsis`. */
export const exitStatus = {
  /** Done; for `summary`: no convergence check failed. */
  ok: 0,
  /** `summary`: a convergence check failed (or there are too few draws to judge). */
  notConverged: 1,
  /** Usage error, or a missing, foreign, damaged or unsafe run folder. */
  error: 2,
  /** Interrupted (Ctrl-C during `resume`); the folder stays resumable. */
  interrupted: 130,
} as const;
