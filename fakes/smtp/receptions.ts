/**
 * Everything the SMTP side accepted, counted per Message-ID before any duplicate suppression, so
 * a test or bench can tell "the client sent it twice" from "the mailbox shows it twice".
 */
export interface ReceptionStats {
  /** Messages accepted over SMTP (250 replies), duplicates included. */
  received: number;
  /** Of those, how many were not stored because their Message-ID had been stored before. */
  suppressedDuplicates: number;
  distinctMessageIds: number;
  /** Message-IDs received more than once, with how often. */
  repeated: Array<{ messageId: string; count: number }>;
}

export class ReceptionLog {
  private received = 0;
  private suppressed = 0;
  private readonly counts = new Map<string, number>();

  /** Counts one accepted message; returns how many times its Message-ID has now been received. */
  record(messageId: string | undefined): number {
    this.received++;
    if (!messageId) return 1;
    const count = (this.counts.get(messageId) ?? 0) + 1;
    this.counts.set(messageId, count);
    return count;
  }

  noteSuppressed(): void {
    this.suppressed++;
  }

  clear(): void {
    this.received = 0;
    this.suppressed = 0;
    this.counts.clear();
  }

  stats(): ReceptionStats {
    const repeated: ReceptionStats["repeated"] = [];
    for (const [messageId, count] of this.counts) if (count > 1) repeated.push({ messageId, count });
    return { received: this.received, suppressedDuplicates: this.suppressed, distinctMessageIds: this.counts.size, repeated };
  }
}
