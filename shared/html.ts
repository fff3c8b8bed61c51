// The five characters that can end a text node or a quoted attribute value in HTML (OWASP XSS
// Prevention Cheat Sheet, output encoding for HTML contexts). Anything put into markup as text
// or as an attribute goes through this; null and undefined become empty text.
const ENTITIES: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' };

export function escapeHtml(value: unknown): string {
  return String(value ?? '').replace(/[&<>"']/g, (c) => ENTITIES[c]!);
}
