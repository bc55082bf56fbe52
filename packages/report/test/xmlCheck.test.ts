import { describe, expect, it } from 'vitest';
import { checkXml } from './xmlCheck.js';

// The checker must itself be able to fail, or the SVG tests prove nothing.
describe('checkXml', () => {
  it('accepts nested, self-closed and escaped markup', () => {
    const r = checkXml('<svg a="1"><g><path d="M0 0"/></g><text>&lt;b&gt; &amp;</text></svg>');
    expect(r.ok).toBe(true);
    expect(r.tags).toEqual({ svg: 1, g: 1, path: 1, text: 1 });
  });
  it('rejects crossed, unclosed and raw markup', () => {
    expect(checkXml('<g><text></g></text>').ok).toBe(false);
    expect(checkXml('<g>').ok).toBe(false);
    expect(checkXml('<text>a < b</text>').ok).toBe(false);
    expect(checkXml('<text>a & b</text>').ok).toBe(false);
    expect(checkXml("<g a='1'/>").ok).toBe(false);
    expect(checkXml('<text>x"><script>1</script></text>').ok).toBe(false);
  });
});
