import { readStoreFile, writeStoreFile } from "./store-file";
import type { MessageFilter, StoredMessage } from "./types";

export type NewMessage = Omit<StoredMessage, "id" | "receivedAt">;

export interface MessageStoreOptions {
  filePath?: string;
  maxMessages: number;
  saveIntervalMs?: number;
  onSaveError: (error: unknown) => void;
}

interface Entry {
  message: StoredMessage;
  /** Only kept when persisting: serialized once so each save is a cheap concatenation. */
  json: string | undefined;
  receivedMs: number;
  recipients: ReadonlySet<string>;
}

const DEFAULT_SAVE_INTERVAL_MS = 500;

/** Messages in arrival order, with the JSON store file written at most once per interval. */
export class MessageStore {
  private entries: Entry[] = [];
  private readonly byId = new Map<string, Entry>();
  private nextId = 1;
  private dirty = false;
  private timer: NodeJS.Timeout | undefined;
  private saving: Promise<void> | undefined;
  private closed = false;

  private constructor(private readonly options: MessageStoreOptions) {}

  static async open(options: MessageStoreOptions): Promise<MessageStore> {
    const store = new MessageStore(options);
    if (options.filePath) {
      const contents = await readStoreFile(options.filePath);
      for (const message of contents.messages.slice(-options.maxMessages)) store.insert(message);
      const highestId = contents.messages.reduce((highest, message) => {
        const id = Number(message.id);
        return Number.isSafeInteger(id) && id > highest ? id : highest;
      }, 0);
      store.nextId = Math.max(contents.nextId, highestId + 1);
    }
    return store;
  }

  get count(): number {
    return this.entries.length;
  }

  add(input: NewMessage): StoredMessage {
    const message: StoredMessage = { id: String(this.nextId++), receivedAt: new Date().toISOString(), ...input };
    this.insert(message);
    const excess = this.entries.length - this.options.maxMessages;
    if (excess > 0) {
      for (const dropped of this.entries.splice(0, excess)) this.byId.delete(dropped.message.id);
    }
    this.markDirty();
    return message;
  }

  get(id: string): StoredMessage | undefined {
    return this.byId.get(id)?.message;
  }

  /** Newest first. */
  list(filter: MessageFilter = {}): StoredMessage[] {
    const matches = compileFilter(filter);
    const result: StoredMessage[] = [];
    for (let i = this.entries.length - 1; i >= 0; i--) {
      const entry = this.entries[i]!;
      if (matches(entry)) result.push(entry.message);
    }
    return result;
  }

  latest(filter: MessageFilter = {}): StoredMessage | undefined {
    const matches = compileFilter(filter);
    for (let i = this.entries.length - 1; i >= 0; i--) {
      const entry = this.entries[i]!;
      if (matches(entry)) return entry.message;
    }
    return undefined;
  }

  clear(): void {
    this.entries = [];
    this.byId.clear();
    this.markDirty();
  }

  /** Writes any pending changes; the store keeps working in memory afterwards. */
  async close(): Promise<void> {
    this.closed = true;
    await this.flush();
  }

  private insert(message: StoredMessage): void {
    const recipients = new Set([...message.to, ...message.cc, ...message.envelope.to].map(normalizeAddress));
    const entry: Entry = {
      message,
      json: this.options.filePath ? JSON.stringify(message) : undefined,
      receivedMs: Date.parse(message.receivedAt),
      recipients,
    };
    this.entries.push(entry);
    this.byId.set(message.id, entry);
  }

  private markDirty(): void {
    if (!this.options.filePath) return;
    this.dirty = true;
    this.armTimer();
  }

  private armTimer(): void {
    if (this.timer || this.saving || this.closed) return;
    this.timer = setTimeout(() => {
      this.timer = undefined;
      void this.flush();
    }, this.options.saveIntervalMs ?? DEFAULT_SAVE_INTERVAL_MS);
    this.timer.unref();
  }

  private async flush(): Promise<void> {
    clearTimeout(this.timer);
    this.timer = undefined;
    while (this.saving) await this.saving;
    const filePath = this.options.filePath;
    if (!filePath || !this.dirty) return;

    this.dirty = false;
    const snapshot = this.entries.map((entry) => entry.json ?? JSON.stringify(entry.message));
    let failed = false;
    this.saving = writeStoreFile(filePath, this.nextId, snapshot)
      .catch((error: unknown) => {
        // Retried on the next change rather than on a timer, so a read-only disk doesn't log every interval.
        failed = true;
        this.dirty = true;
        this.options.onSaveError(error);
      })
      .finally(() => {
        this.saving = undefined;
      });
    await this.saving;
    // Changes that arrived during the write still need their own save.
    if (this.dirty && !failed && !this.closed) this.armTimer();
  }
}

export function normalizeAddress(address: string): string {
  return address.trim().toLowerCase();
}

function compileFilter(filter: MessageFilter): (entry: Entry) => boolean {
  const to = filter.to ? normalizeAddress(filter.to) : undefined;
  const sinceMs = filter.since === undefined ? undefined : Date.parse(filter.since);
  if (Number.isNaN(sinceMs)) throw new RangeError(`"since" must be an ISO timestamp, got ${JSON.stringify(filter.since)}`);
  const subject = filter.subjectIncludes?.toLowerCase();

  return (entry) =>
    (to === undefined || entry.recipients.has(to)) &&
    (sinceMs === undefined || entry.receivedMs >= sinceMs) &&
    (subject === undefined || entry.message.subject.toLowerCase().includes(subject));
}
