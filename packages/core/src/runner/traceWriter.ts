import { closeSync, fsyncSync, ftruncateSync, openSync, writeSync } from 'node:fs';
import type { RowBlock } from './rowBlock.js';
import { formatRows } from './traceFormat.js';

/** Appends one chain's rows to its trace file and keeps count of rows and bytes. */
export interface TraceWriter {
  /** Bytes in the file (header included) once pending writes are done. */
  readonly bytes: number;
  /** Rows in the file after the header. */
  readonly rows: number;
  /** Appends a block's rows (written to the operating system at once, not yet fsynced). */
  append(block: RowBlock): void;
  /** fsyncs the file, so what was appended survives a power loss. */
  sync(): void;
  close(): void;
}

function writeAll(fd: number, bytes: Uint8Array, position: number): void {
  let at = 0;
  while (at < bytes.length) at += writeSync(fd, bytes, at, bytes.length - at, position + at);
}

/**
 * Opens a trace file. With `resumeAt`, the file is cut back to `resumeAt.bytes` (the
 * end of row `resumeAt.rows − 1`) and appended from there; otherwise it is created
 * (replacing any file) with `header` as its first line.
 */
export function openTraceWriter(
  path: string,
  header: string,
  dim: number,
  outputs: number,
  resumeAt?: { readonly bytes: number; readonly rows: number },
): TraceWriter {
  let fd: number;
  let bytes: number;
  let rows: number;
  if (resumeAt) {
    fd = openSync(path, 'r+');
    ftruncateSync(fd, resumeAt.bytes);
    bytes = resumeAt.bytes;
    rows = resumeAt.rows;
  } else {
    fd = openSync(path, 'w');
    const h = Buffer.from(header, 'utf8');
    writeAll(fd, h, 0);
    bytes = h.length;
    rows = 0;
  }
  return {
    get bytes() {
      return bytes;
    },
    get rows() {
      return rows;
    },
    append(block) {
      if (block.count === 0) return;
      const text = Buffer.from(formatRows(block, dim, outputs), 'utf8');
      writeAll(fd, text, bytes);
      bytes += text.length;
      rows += block.count;
    },
    sync() {
      fsyncSync(fd);
    },
    close() {
      closeSync(fd);
    },
  };
}
