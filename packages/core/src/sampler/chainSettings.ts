import { z } from 'zod';
import {
  defaultDualAveragingConstants,
  type DualAveragingConstants,
} from './dualAveraging.js';
import { SamplerOptionsError } from './errors.js';
import type { MetricKind } from './metric.js';
import { parseOptions } from './optionErrors.js';
import type { StaticPath } from './staticHmc.js';
import { warmupSchedule, type WarmupSchedule } from './warmupSchedule.js';

/** Sampling methods. */
export type SamplerMethod = 'nuts' | 'hmc';

/** Everything that decides how a chain moves; plain data, safe to send to a worker. */
export interface ChainSettings {
  readonly method: SamplerMethod;
  /** Warmup (adaptation) iterations, discarded by default. */
  readonly warmup: number;
  /** Iterations kept after warmup. */
  readonly draws: number;
  /** Metric family adapted during warmup. */
  readonly metric: MetricKind;
  /** Acceptance statistic that dual averaging aims for, in (0, 1). */
  readonly targetAcceptance: number;
  /** NUTS: at most 2^maxTreeDepth − 1 leapfrog steps per transition. */
  readonly maxTreeDepth: number;
  /** Static HMC: a fixed number of steps or a path length. */
  readonly path: StaticPath;
  /** Static HMC: relative step-size jitter in [0, 1). */
  readonly jitter: number;
  /** Starting step size for the heuristic (or the fixed step size when warmup is 0). */
  readonly initialStepSize: number | null;
  readonly dualAveraging: DualAveragingConstants;
  readonly schedule: WarmupSchedule;
}

/** The user-facing knobs of {@link ChainSettings}, all optional. */
export interface ChainSettingsInput {
  method?: SamplerMethod;
  warmup?: number;
  draws?: number;
  metric?: MetricKind;
  targetAcceptance?: number;
  maxTreeDepth?: number;
  steps?: number;
  pathLength?: number;
  jitter?: number;
  initialStepSize?: number;
}

/** Default number of leapfrog steps of static HMC when neither steps nor path length is set. */
export const defaultHmcSteps = 10;

/** Descriptions of valid values, one per option, used in error messages. */
export const chainSettingsExpected: Readonly<Record<keyof ChainSettingsInput, string>> = {
  method: `'nuts' or 'hmc'`,
  warmup: 'an integer >= 0',
  draws: 'an integer >= 0',
  metric: `'diagonal', 'dense' or 'unit'`,
  targetAcceptance: 'a number strictly between 0 and 1',
  maxTreeDepth: 'an integer from 1 to 20',
  steps: 'an integer from 1 to 100000 (static HMC leapfrog steps)',
  pathLength: 'a finite number > 0 (static HMC integration time)',
  jitter: 'a number >= 0 and < 1',
  initialStepSize: 'a finite number > 0',
};

const finite = z.number().refine(Number.isFinite);

/** The zod shape of {@link ChainSettingsInput}, shared with `runChains`' options. */
export const chainSettingsShape = {
  method: z.enum(['nuts', 'hmc']).optional(),
  warmup: z.number().int().min(0).max(1e9).optional(),
  draws: z.number().int().min(0).max(1e9).optional(),
  metric: z.enum(['diagonal', 'dense', 'unit']).optional(),
  targetAcceptance: finite.pipe(z.number().gt(0).lt(1)).optional(),
  maxTreeDepth: z.number().int().min(1).max(20).optional(),
  steps: z.number().int().min(1).max(100000).optional(),
  pathLength: finite.pipe(z.number().gt(0)).optional(),
  jitter: z.number().min(0).lt(1).optional(),
  initialStepSize: finite.pipe(z.number().gt(0)).optional(),
};

const chainSettingsSchema = z.strictObject(chainSettingsShape);

/**
 * Validated, defaulted settings from user input: NUTS, warmup 1000, draws 1000,
 * diagonal metric, target acceptance 0.8, maximum tree depth 10, static HMC with 10
 * steps and no jitter. Throws {@link SamplerOptionsError} naming the bad option.
 */
export function resolveChainSettings(
  input: ChainSettingsInput = {},
  entry = 'resolveChainSettings',
): ChainSettings {
  const o = parseOptions(chainSettingsSchema, input, entry, chainSettingsExpected);
  return settingsFromParsed(o, entry);
}

/** Builds settings from already-parsed options (shared with `runChains`). */
export function settingsFromParsed(
  o: z.output<typeof chainSettingsSchema>,
  entry: string,
): ChainSettings {
  const method = o.method ?? 'nuts';
  if (method === 'nuts') {
    for (const key of ['steps', 'pathLength', 'jitter'] as const) {
      if (o[key] !== undefined) {
        throw new SamplerOptionsError(
          `${entry}: option \`${key}\` = ${String(o[key])} applies only to method 'hmc', but method is 'nuts'`,
        );
      }
    }
  }
  if (o.steps !== undefined && o.pathLength !== undefined) {
    throw new SamplerOptionsError(
      `${entry}: options \`steps\` = ${o.steps} and \`pathLength\` = ${o.pathLength} exclude each other: give one`,
    );
  }
  const warmup = o.warmup ?? 1000;
  const metric = o.metric ?? 'diagonal';
  const path: StaticPath =
    o.pathLength !== undefined ? { pathLength: o.pathLength } : { steps: o.steps ?? defaultHmcSteps };
  return {
    method,
    warmup,
    draws: o.draws ?? 1000,
    metric,
    targetAcceptance: o.targetAcceptance ?? 0.8,
    maxTreeDepth: o.maxTreeDepth ?? 10,
    path,
    jitter: o.jitter ?? 0,
    initialStepSize: o.initialStepSize ?? null,
    dualAveraging: defaultDualAveragingConstants,
    schedule: warmupSchedule(warmup, metric !== 'unit'),
  };
}
