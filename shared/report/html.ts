// Escaping for text placed into HTML and SVG, so traveler names and flight numbers from
// pasted input can never become markup.

const ENTITIES: Readonly<Record<string, string>> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' };

/**
 * Escapes the five characters that are special in HTML text and attribute values.
 * @example escapeHtml('<b>"A&B"</b>') // "&lt;b&gt;&quot;A&amp;B&quot;&lt;/b&gt;"
 */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ENTITIES[c] ?? c);
}
