const replacements: Record<string, string> = {
  "&": "&amp;",
  "<": "&lt;",
  ">": "&gt;",
  '"': "&quot;",
  "'": "&#39;",
};

/** Safe for text content and for quoted attribute values (including `srcdoc`). */
export function escapeHtml(value: string): string {
  return value.replace(/[&<>"']/g, (char) => replacements[char] ?? char);
}
