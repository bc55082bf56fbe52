/**
 * Escapes text for HTML and SVG element content and attribute values.
 * Every string that comes from a run folder (quantity names, units, titles, notes,
 * warning messages) passes through here before it reaches the page.
 */
export function escapeText(value: string): string {
  return value.replace(/[&<>"']/g, (c) => ESCAPES[c] ?? c);
}

const ESCAPES: Record<string, string> = {
  '&': '&amp;',
  '<': '&lt;',
  '>': '&gt;',
  '"': '&quot;',
  "'": '&#39;',
};
