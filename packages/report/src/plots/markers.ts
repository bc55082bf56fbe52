/**
 * Marker shapes for data groups, so groups differ in shape as well as colour.
 * Each returns path data for one marker centred at (x, y) with size r (pixels).
 */
import { px } from '../svg.js';

export type MarkerShape = 'circle' | 'square' | 'triangle' | 'diamond' | 'triangleDown' | 'hexagon';

const order: MarkerShape[] = ['circle', 'square', 'triangle', 'diamond', 'triangleDown', 'hexagon'];

/** The shape of group i. */
export function groupShape(i: number): MarkerShape {
  return order[i % order.length];
}

/** Path data of one marker. */
export function markerPath(shape: MarkerShape, x: number, y: number, r: number): string {
  const X = px(x);
  const Y = px(y);
  switch (shape) {
    case 'circle':
      return `M${px(x - r)} ${Y}a${px(r)} ${px(r)} 0 1 0 ${px(2 * r)} 0a${px(r)} ${px(r)} 0 1 0 ${px(-2 * r)} 0Z`;
    case 'square': {
      const s = r * 0.9;
      return `M${px(x - s)} ${px(y - s)}h${px(2 * s)}v${px(2 * s)}h${px(-2 * s)}Z`;
    }
    case 'triangle':
      return `M${X} ${px(y - r * 1.2)}L${px(x + r * 1.1)} ${px(y + r * 0.8)}H${px(x - r * 1.1)}Z`;
    case 'triangleDown':
      return `M${X} ${px(y + r * 1.2)}L${px(x + r * 1.1)} ${px(y - r * 0.8)}H${px(x - r * 1.1)}Z`;
    case 'diamond':
      return `M${X} ${px(y - r * 1.25)}L${px(x + r)} ${Y}L${X} ${px(y + r * 1.25)}L${px(x - r)} ${Y}Z`;
    case 'hexagon': {
      let d = '';
      for (let k = 0; k < 6; k++) {
        const a = (Math.PI / 3) * k;
        d += `${k === 0 ? 'M' : 'L'}${px(x + r * Math.cos(a))} ${px(y + r * Math.sin(a))}`;
      }
      return `${d}Z`;
    }
  }
}
