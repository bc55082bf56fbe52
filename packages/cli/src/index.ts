export { runCli } from './runCli.js';
export { exitStatus, type CliIo } from './cliIo.js';
export { CliUsageError } from './cliErrors.js';
export { helpText } from './helpText.js';
export { runDiagnostics, runQuantities, type RunDiagnostics } from './runDiagnostics.js';
export { reportInputFromRun } from './reportInputFromRun.js';
