export interface StoredAttachment {
  filename: string | null;
  contentType: string;
  size: number;
}

export interface StoredMessage {
  id: string;
  /** ISO 8601, UTC. */
  receivedAt: string;
  /** The From header as written, e.g. `"Proofbay" <hello@proofbay.test>`. */
  from: string;
  /** Addresses in the To header. */
  to: string[];
  cc: string[];
  /** What the client said in MAIL FROM / RCPT TO; Bcc recipients only show up here. */
  envelope: { from: string | null; to: string[] };
  subject: string;
  text: string;
  html: string | null;
  /** Header name (lowercase) → raw, unfolded value. The first occurrence wins for repeated headers. */
  headers: Record<string, string>;
  attachments: StoredAttachment[];
}

export interface MessageFilter {
  /** Matches To, Cc and envelope recipients, case-insensitively. */
  to?: string;
  /** ISO timestamp; only messages received at or after it. */
  since?: string;
  subjectIncludes?: string;
}
