/**
 * A Content-Disposition value with the file name in both forms RFC 6266 §4.3 recommends: a plain
 * `filename="…"` that every client reads (ASCII only, here with accents dropped and other
 * characters replaced), and `filename*=UTF-8''…` (RFC 8187, formerly RFC 5987) with the real name
 * percent-encoded, which current browsers prefer. Quotes, backslashes and control characters
 * (CR, LF: header injection) never reach the header.
 */
export function contentDisposition(type: "inline" | "attachment", fileName: string): string {
  const name = fileName.replace(/[\u0000-\u001f\u007f-\u009f"\\]/g, "").trim() || "download";
  const fallback = asciiFallback(name);
  if (fallback === name) return `${type}; filename="${name}"`;
  return `${type}; filename="${fallback}"; filename*=UTF-8''${encodeRfc8187(name)}`;
}

function asciiFallback(name: string): string {
  return name
    .normalize("NFKD")
    .replace(/[\u0300-\u036f]/g, "") // combining accents: "é" → "e"
    .replace(/[^\x20-\x7e]/g, "_")
    .replace(/%/g, "_"); // some clients percent-decode the plain form
}

/** RFC 8187 attr-char leaves ALPHA DIGIT !#$&+-.^_`|~ as they are and percent-encodes the rest. */
function encodeRfc8187(value: string): string {
  return encodeURIComponent(value).replace(/['()*]/g, (char) => `%${char.charCodeAt(0).toString(16).toUpperCase()}`);
}
