// The one way text from the data reaches the report: every id, name, attribute value, path and
// message goes through escapeHtml, whether it lands in element content or in a quoted attribute.

const ENTITIES: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' };

/**
 * Text safe inside HTML or SVG element content and inside single- or double-quoted attributes.
 * Example: escapeHtml('<script>') === '&lt;script&gt;'
 */
export function escapeHtml(value: unknown): string {
  return String(value).replace(/[&<>"']/g, (ch) => ENTITIES[ch]);
}
