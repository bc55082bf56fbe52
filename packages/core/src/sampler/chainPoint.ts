/** The position a chain is at, with the log-density and gradient already evaluated there. */
export interface ChainPoint {
  readonly position: Float64Array;
  readonly gradient: Float64Array;
  logDensity: number;
}
