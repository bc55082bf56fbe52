/**
 * A tiny well-formedness check for the SVG and HTML fragments the report writes:
 * every tag is either self-closed or closed in order, attributes are double-quoted,
 * and text holds no raw '<' and only known entities. (XML 1.0, sec. 2.1 and 2.4,
 * restricted to what the report emits; common practice.)
 */
export interface XmlCheck {
  ok: boolean;
  error?: string;
  /** Count of elements by tag name. */
  tags: Record<string, number>;
}

const TAG = /<(\/?)([a-zA-Z][\w:-]*)((?:\s+[\w:-]+="[^"<]*")*)\s*(\/?)>/y;
const ENTITY = /&(amp|lt|gt|quot|#39|#x[0-9a-fA-F]+|#[0-9]+);/y;
const VOID_HTML = new Set(['meta', 'br', 'link', 'img', 'hr', 'input']);

export function checkXml(source: string, options: { html?: boolean } = {}): XmlCheck {
  const tags: Record<string, number> = {};
  const stack: string[] = [];
  let i = 0;
  while (i < source.length) {
    const c = source[i];
    if (c === '<') {
      if (source.startsWith('<!DOCTYPE', i)) {
        const end = source.indexOf('>', i);
        i = end + 1;
        continue;
      }
      TAG.lastIndex = i;
      const m = TAG.exec(source);
      if (!m) return { ok: false, error: `bad tag at ${i}: ${source.slice(i, i + 60)}`, tags };
      const [, closing, name, , selfClosing] = m;
      if (closing) {
        const open = stack.pop();
        if (open !== name) return { ok: false, error: `</${name}> closes <${open}> at ${i}`, tags };
      } else {
        tags[name] = (tags[name] ?? 0) + 1;
        if (!selfClosing && !(options.html && VOID_HTML.has(name))) stack.push(name);
      }
      i = TAG.lastIndex;
      if (name === 'style' && !closing && !selfClosing) {
        const end = source.indexOf('</style>', i);
        if (end < 0) return { ok: false, error: 'unclosed <style>', tags };
        i = end;
      }
    } else if (c === '&') {
      ENTITY.lastIndex = i;
      const m = ENTITY.exec(source);
      if (!m) return { ok: false, error: `bare & at ${i}: ${source.slice(i, i + 20)}`, tags };
      i = ENTITY.lastIndex;
    } else if (c === '>') {
      return { ok: false, error: `stray > at ${i}`, tags };
    } else {
      i++;
    }
  }
  if (stack.length > 0) return { ok: false, error: `unclosed <${stack.join('>, <')}>`, tags };
  return { ok: true, tags };
}

/** The `points` attribute of every polyline, as point counts. */
export function polylinePointCounts(svg: string, className?: string): number[] {
  const out: number[] = [];
  for (const m of svg.matchAll(/<polyline([^>]*)\/>/g)) {
    const attrs = m[1];
    if (className && !attrs.includes(`class="${className}"`)) continue;
    const pts = /points="([^"]*)"/.exec(attrs)?.[1] ?? '';
    out.push(pts.trim() === '' ? 0 : pts.trim().split(/\s+/).length);
  }
  return out;
}

/** Number of elements carrying class `name` (exact class attribute). */
export function countClass(markup: string, name: string): number {
  return markup.split(`class="${name}"`).length - 1;
}

/** The standalone <svg> elements of a page, in order. */
export function svgElements(html: string, kind?: string): string[] {
  const out: string[] = [];
  for (const m of html.matchAll(/<svg xmlns="http:\/\/www\.w3\.org\/2000\/svg" class="plot[^"]*" data-plot="([^"]+)"[\s\S]*?<\/svg>/g)) {
    if (!kind || m[1] === kind) out.push(m[0]);
  }
  return out;
}
