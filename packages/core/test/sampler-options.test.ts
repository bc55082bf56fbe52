import { describe, expect, it } from 'vitest';
import {
  InitialisationError,
  resolveChainSettings,
  runChains,
  SamplerOptionsError,
} from '../src/sampler/index.js';
import type { Target } from '../src/target.js';
import { standardNormal } from './support/targets.js';

const target = standardNormal(2);

async function optionError(options: unknown): Promise<string> {
  try {
    await runChains(target, options as never);
  } catch (e) {
    expect(e).toBeInstanceOf(SamplerOptionsError);
    return (e as Error).message;
  }
  throw new Error('expected runChains to reject');
}

describe('runChains option validation', () => {
  it.each([
    [{ chains: 0 }, /option `chains` = 0: expected an integer from 1 to 1024/],
    [{ chains: 2.5 }, /option `chains` = 2.5/],
    [{ warmup: -1 }, /option `warmup` = -1: expected an integer >= 0/],
    [{ draws: 'many' }, /option `draws` = "many": expected an integer >= 0/],
    [{ seed: -3 }, /option `seed` = -3: expected a safe integer >= 0/],
    [{ seed: 1.5 }, /option `seed` = 1.5/],
    [{ method: 'gibbs' }, /option `method` = "gibbs": expected 'nuts' or 'hmc'/],
    [{ metric: 'full' }, /option `metric` = "full": expected 'diagonal', 'dense' or 'unit'/],
    [{ targetAcceptance: 1 }, /option `targetAcceptance` = 1: expected a number strictly between 0 and 1/],
    [{ targetAcceptance: Number.NaN }, /option `targetAcceptance` = NaN/],
    [{ maxTreeDepth: 0 }, /option `maxTreeDepth` = 0: expected an integer from 1 to 20/],
    [{ method: 'hmc', steps: 0 }, /option `steps` = 0/],
    [{ method: 'hmc', pathLength: -1 }, /option `pathLength` = -1/],
    [{ method: 'hmc', jitter: 1 }, /option `jitter` = 1: expected a number >= 0 and < 1/],
    [{ initialStepSize: 0 }, /option `initialStepSize` = 0: expected a finite number > 0/],
    [{ init: [[0, 'a']] }, /option `init\[0\]` = an array of length 2/],
    [{ onProgress: 5 }, /option `onProgress` = 5: expected a function/],
    [{ keepWarmup: 'yes' }, /option `keepWarmup` = "yes": expected true or false/],
    [{ signal: {} }, /option `signal` = an object: expected an AbortSignal/],
    [{ chain: 4 }, /unknown option `chain`; known options: chains/],
    [{ steps: 5 }, /option `steps` = 5 applies only to method 'hmc'/],
    [{ method: 'hmc', steps: 5, pathLength: 2 }, /`steps` = 5 and `pathLength` = 2 exclude each other/],
    [{ chains: 2, init: [[0, 0]] }, /option `init` has 1 positions: expected one per chain \(chains = 2\)/],
    [{ chains: 1, init: [[0, 0, 0]] }, /option `init\[0\]` has length 3: expected target.dim = 2/],
  ])('%o is rejected with a message naming the option', async (options, pattern) => {
    expect(await optionError(options)).toMatch(pattern);
  });

  it('rejects a non-object options argument and a malformed target', async () => {
    expect(await optionError(7)).toMatch(/options = 7: expected an object/);
    await expect(runChains({ dim: 0, logDensityGrad: () => 0 } as Target)).rejects.toThrow(/target.dim = 0/);
    await expect(runChains({ dim: 1 } as unknown as Target)).rejects.toThrow(/logDensityGrad is not a function/);
  });

  it('fills in the documented defaults', () => {
    const s = resolveChainSettings();
    expect(s).toMatchObject({
      method: 'nuts',
      warmup: 1000,
      draws: 1000,
      metric: 'diagonal',
      targetAcceptance: 0.8,
      maxTreeDepth: 10,
      initialStepSize: null,
      dualAveraging: { gamma: 0.05, t0: 10, kappa: 0.75 },
    });
    expect(resolveChainSettings({ method: 'hmc' }).path).toEqual({ steps: 10 });
  });
});

describe('initialisation', () => {
  it('retries random starts until the density and gradient are finite', async () => {
    // Support x > 0 in 3 coordinates: a uniform (−2, 2) start lands inside with
    // probability 1/8, so 100 attempts fail with probability (7/8)^100 ≈ 1.6e-6.
    const orthant: Target = {
      dim: 3,
      logDensityGrad(x, g) {
        let lp = 0;
        for (let i = 0; i < 3; i++) {
          if (!(x[i] > 0)) return -Infinity;
          lp += -x[i];
          g[i] = -1;
        }
        return lp;
      },
    };
    const r = await runChains(orthant, { chains: 2, warmup: 50, draws: 20, seed: 3 });
    for (const d of r.draws) for (const v of d) expect(v).toBeGreaterThan(0);
  });

  it('reports a clear error when no start is finite', async () => {
    const nowhere: Target = { dim: 2, logDensityGrad: () => Number.NaN };
    await expect(runChains(nowhere, { chains: 1, seed: 1 })).rejects.toThrow(InitialisationError);
    await expect(runChains(nowhere, { chains: 1, seed: 1 })).rejects.toThrow(
      /chain 0: no finite log-density and gradient at 100 random starts/,
    );
  });

  it('rejects a user start outside the support, and one with a non-finite gradient', async () => {
    const half: Target = {
      dim: 1,
      logDensityGrad(x, g) {
        g[0] = x[0] === 0 ? Number.NaN : -1;
        return x[0] >= 0 ? -x[0] : -Infinity;
      },
    };
    await expect(runChains(half, { chains: 1, init: [[-1]] })).rejects.toThrow(/chain 0: at the given init the log-density is -Infinity/);
    await expect(runChains(half, { chains: 1, init: [[0]] })).rejects.toThrow(/gradient has a non-finite entry/);
  });

  it('starts from user-supplied positions', async () => {
    const r = await runChains(standardNormal(2), {
      chains: 2,
      warmup: 0,
      draws: 1,
      initialStepSize: 1e-9,
      init: [Float64Array.from([3, 4]), [-5, 6]],
      seed: 1,
    });
    // With steps of 1e-9 (at most 1023 of them) the first draw stays within 1e-4 of the start.
    expect(r.draws[0][0]).toBeCloseTo(3, 4);
    expect(r.draws[1][1]).toBeCloseTo(6, 4);
  });
});
