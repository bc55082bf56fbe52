export { createRunningDiagnostics } from './runningState.js';
export type { RunningDiagnosticsState, RunningDiagnosticsOptions } from './runningState.js';
export { addDraws } from './addDraws.js';
export { readRunningDiagnostics } from './readRunning.js';
export type { RunningQuantity, RunningSnapshot } from './readRunning.js';
