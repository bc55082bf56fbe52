/** Writing the report into a run folder. */
import { mkdir, rename, rm, writeFile } from 'node:fs/promises';
import { join, resolve } from 'node:path';
import type { ReportInput } from './input.js';
import { renderReport } from './renderReport.js';

/** File name of the report inside its folder. */
export const REPORT_FILE = 'report.html';

/**
 * Renders the report and writes `<folder>/report.html`, creating the folder if
 * needed. The file is written under a temporary name in the same folder and then
 * renamed, so a reader never sees half a report. Resolves to the file's absolute path.
 */
export async function writeReport(input: ReportInput, folder: string): Promise<string> {
  const html = renderReport(input);
  const dir = resolve(folder);
  await mkdir(dir, { recursive: true });
  const target = join(dir, REPORT_FILE);
  const temp = join(dir, `.${REPORT_FILE}.${process.pid}.${Date.now().toString(36)}${Math.random().toString(36).slice(2, 8)}.tmp`);
  try {
    await writeFile(temp, html, 'utf8');
    await rename(temp, target);
  } catch (error) {
    await rm(temp, { force: true });
    throw error;
  }
  return target;
}
