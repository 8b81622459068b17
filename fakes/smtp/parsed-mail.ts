import type { AddressObject, EmailAddress, ParsedMail } from "mailparser";
import type { NewMessage } from "./message-store";

export interface Envelope {
  from: string | null;
  to: string[];
}

export function toNewMessage(parsed: ParsedMail, envelope: Envelope): NewMessage {
  return {
    from: parsed.from?.text ?? envelope.from ?? "",
    to: addressesOf(parsed.to),
    cc: addressesOf(parsed.cc),
    envelope,
    subject: parsed.subject ?? "",
    text: parsed.text ?? "",
    html: typeof parsed.html === "string" ? parsed.html : null,
    headers: rawHeaders(parsed.headerLines),
    attachments: parsed.attachments.map((attachment) => ({
      filename: attachment.filename ?? null,
      contentType: attachment.contentType,
      size: attachment.size,
    })),
  };
}

function addressesOf(field: AddressObject | AddressObject[] | undefined): string[] {
  if (!field) return [];
  const objects = Array.isArray(field) ? field : [field];
  return objects.flatMap((object) => flatten(object.value));
}

function flatten(addresses: EmailAddress[]): string[] {
  return addresses.flatMap((entry) => (entry.group ? flatten(entry.group) : entry.address ? [entry.address] : []));
}

// Raw values rather than mailparser's parsed ones, so tests can assert on exactly what was sent
// (e.g. the `<https://…>, <mailto:…>` form of List-Unsubscribe).
function rawHeaders(lines: ParsedMail["headerLines"]): Record<string, string> {
  const headers: Record<string, string> = {};
  for (const { key, line } of lines) {
    if (key in headers) continue;
    const colon = line.indexOf(":");
    headers[key] = line
      .slice(colon + 1)
      .replace(/\r?\n(?=[ \t])/g, "")
      .trim();
  }
  return headers;
}
