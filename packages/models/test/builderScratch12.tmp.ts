import { createRandomStream } from '@apsis/core';
import { createRvModel } from '../src/index.js';
import { rvData } from './builderFixtures.js';
const model = await createRvModel({
  rv: rvData(50, 'grad-rv'),
  planets: [{ label: 'b', period: 4.2317 }, { label: 'c', period: 21.9 }],
  star: { mass: 0.92, massUncertainty: 0.04 },
  trend: 'quadratic',
  priors: { eccentricity_c: { beta: [0.867, 3.03] } },
});
const s = createRandomStream('grad-rv-x');
const xs = [new Float64Array(model.dim)];
for (let k = 0; k < 3; k++) xs.push(Float64Array.from({ length: model.dim }, () => s.normal()));
for (const x of xs) {
  const g = new Float64Array(model.dim);
  console.log(model.logDensityGrad(x, g), model.valuesAt(x).eccentricity_c, model.valuesAt(x).eccentricity_b, g[7], g[8]);
}
console.log(model.parameters.map((p) => p.names.join(',') + ' ' + p.centre.join(',')).join('\n'));
