import { mkdir, open, readFile, rename } from "node:fs/promises";
import path from "node:path";
import type { StoredMessage } from "./types";

const FORMAT_VERSION = 1;
const WRITE_CHUNK_CHARS = 1 << 20;

export interface StoreFileContents {
  nextId: number;
  messages: StoredMessage[];
}

export async function readStoreFile(filePath: string): Promise<StoreFileContents> {
  let raw: string;
  try {
    raw = await readFile(filePath, "utf8");
  } catch (error) {
    if (isErrnoException(error) && error.code === "ENOENT") return { nextId: 1, messages: [] };
    throw error;
  }

  const parsed: unknown = JSON.parse(raw);
  if (!isRecord(parsed) || parsed.version !== FORMAT_VERSION || !Array.isArray(parsed.messages)) {
    throw new Error(`${filePath} is not a fake inbox store (version ${FORMAT_VERSION}); delete it or pick another INBOX_STORE`);
  }
  const messages = parsed.messages.filter(isStoredMessage);
  const nextId = typeof parsed.nextId === "number" && Number.isSafeInteger(parsed.nextId) ? parsed.nextId : 1;
  return { nextId, messages };
}

/**
 * Takes each message already serialized, so a save only concatenates strings instead of
 * re-stringifying thousands of messages. Writes to a temp file and renames it, so a crash
 * mid-write never leaves a truncated store behind.
 */
export async function writeStoreFile(filePath: string, nextId: number, serializedMessages: readonly string[]): Promise<void> {
  await mkdir(path.dirname(filePath), { recursive: true });
  const tempPath = `${filePath}.${process.pid}.tmp`;
  const handle = await open(tempPath, "w");
  try {
    let buffer = `{"version":${FORMAT_VERSION},"nextId":${nextId},"messages":[`;
    for (let i = 0; i < serializedMessages.length; i++) {
      buffer += (i === 0 ? "" : ",\n") + serializedMessages[i];
      if (buffer.length >= WRITE_CHUNK_CHARS) {
        await handle.write(buffer);
        buffer = "";
      }
    }
    await handle.write(`${buffer}]}\n`);
  } finally {
    await handle.close();
  }
  await rename(tempPath, filePath);
}

function isStoredMessage(value: unknown): value is StoredMessage {
  return (
    isRecord(value) &&
    typeof value.id === "string" &&
    typeof value.receivedAt === "string" &&
    typeof value.subject === "string" &&
    Array.isArray(value.to) &&
    isRecord(value.envelope) &&
    isRecord(value.headers)
  );
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === "object" && value !== null && !Array.isArray(value);
}

function isErrnoException(error: unknown): error is NodeJS.ErrnoException {
  return error instanceof Error && "code" in error;
}
