/**
 * Colours. Chains and data groups use the Okabe–Ito palette (Okabe & Ito 2008,
 * "Color Universal Design"), whose eight colours stay distinguishable under the
 * common forms of colour-vision deficiency. Yellow is last because it has little
 * contrast on white. Colour is never the only cue: chains are numbered in legends,
 * data groups also get a marker shape, divergent draws get their own mark.
 */
export const okabeIto = {
  blue: '#0072B2',
  orange: '#E69F00',
  bluishGreen: '#009E73',
  reddishPurple: '#CC79A7',
  skyBlue: '#56B4E9',
  vermillion: '#D55E00',
  yellow: '#F0E442',
  black: '#000000',
} as const;

const series = [
  okabeIto.blue,
  okabeIto.orange,
  okabeIto.bluishGreen,
  okabeIto.reddishPurple,
  okabeIto.skyBlue,
  okabeIto.vermillion,
  okabeIto.black,
  okabeIto.yellow,
];

/** Colour of series i (chain or data group), cycling through the palette. */
export function seriesColour(i: number): string {
  return series[((i % series.length) + series.length) % series.length];
}

/**
 * Dash pattern for series i: solid for the first eight, dashed once the colours
 * repeat, so chain 9 is not mistaken for chain 1.
 */
export function seriesDash(i: number): string | undefined {
  const round = Math.floor(i / series.length);
  if (round === 0) return undefined;
  return round === 1 ? '5 3' : '2 2';
}

/** Neutral tones for axes, grid lines, text and model draws. */
export const ink = {
  text: '#1f1f1f',
  axis: '#4d4d4d',
  grid: '#e3e3e3',
  model: '#3a3a3a',
  band: '#d9d9d9',
  divergent: '#000000',
} as const;
