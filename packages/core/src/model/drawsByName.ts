import { ParameterValueError } from './errors.js';

/** The part of a `runChains` result this helper reads. */
export interface RecordedOutputs {
  readonly outputs?: { readonly names: readonly string[]; readonly values: readonly Float64Array[] };
}

/**
 * Splits the recorded outputs of a run (constrained values and derived quantities,
 * draws × columns per chain) into one array of chains per column name:
 * `drawsByName(result).period[chain][draw]`. The per-column arrays are what
 * `@apsis/diagnostics` functions such as `bulkEss(chains)` take.
 */
export function drawsByName(result: RecordedOutputs): Record<string, Float64Array[]> {
  const outputs = result?.outputs;
  if (!outputs || !Array.isArray(outputs.names) || !Array.isArray(outputs.values)) {
    throw new ParameterValueError('result.outputs', outputs, 'recorded outputs { names, values }: run a target that has outputs (a compiled model)');
  }
  const width = outputs.names.length;
  const out: Record<string, Float64Array[]> = {};
  outputs.names.forEach((name, k) => {
    out[name] = outputs.values.map((block) => {
      const n = Math.floor(block.length / width);
      const column = new Float64Array(n);
      for (let i = 0; i < n; i++) column[i] = block[i * width + k];
      return column;
    });
  });
  return out;
}
