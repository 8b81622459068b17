import type { StoredMessage } from "./types";

export type { StoredMessage } from "./types";

export interface WaitForMessageOptions {
  /** Defaults to 10 s. */
  timeoutMs?: number;
  /** ISO timestamp; ignore mail received before it (e.g. from an earlier test). */
  since?: string;
  /** Case-insensitive substring of the subject. */
  subjectIncludes?: string;
}

const POLL_INTERVAL_MS = 100;

/** Resolves with the newest message to `to` that matches, polling until one arrives. */
export async function waitForMessage(inboxUrl: string, to: string, options: WaitForMessageOptions = {}): Promise<StoredMessage> {
  const timeoutMs = options.timeoutMs ?? 10_000;
  const deadline = Date.now() + timeoutMs;
  const url = new URL("/api/messages/latest", inboxUrl);
  url.searchParams.set("to", to);
  if (options.since) url.searchParams.set("since", options.since);
  if (options.subjectIncludes) url.searchParams.set("subject", options.subjectIncludes);

  let lastProblem = "nothing matched yet";
  for (;;) {
    let response: Response | undefined;
    try {
      response = await fetch(url, { signal: AbortSignal.timeout(Math.max(deadline - Date.now(), 1)) });
    } catch (error) {
      lastProblem = `last poll failed: ${error instanceof Error ? error.message : String(error)}`;
    }
    if (response?.ok) return (await response.json()) as StoredMessage;
    if (response) {
      const body = await response.text();
      // A 400 means the query itself is wrong; waiting longer will not fix it.
      if (response.status >= 400 && response.status < 500 && response.status !== 404) {
        throw new Error(`Fake inbox rejected ${url.href}: ${response.status} ${body}`);
      }
      lastProblem = response.status === 404 ? "nothing matched yet" : `last poll got ${response.status} ${body}`;
    }

    if (Date.now() + POLL_INTERVAL_MS > deadline) {
      const criteria = [options.subjectIncludes && `subject containing "${options.subjectIncludes}"`, options.since && `since ${options.since}`]
        .filter(Boolean)
        .join(", ");
      throw new Error(`No mail to ${to}${criteria ? ` (${criteria})` : ""} reached ${inboxUrl} within ${timeoutMs} ms; ${lastProblem}`);
    }
    await new Promise((resolve) => setTimeout(resolve, POLL_INTERVAL_MS));
  }
}

const NAMED_ENTITIES: Record<string, string> = { amp: "&", lt: "<", gt: ">", quot: '"', apos: "'", nbsp: "\u00a0" };

/** The href of every `<a>` and `<area>` in document order, entities decoded (`&amp;` → `&`). */
export function extractLinks(html: string): string[] {
  const withoutComments = html.replace(/<!--[\s\S]*?-->/g, "");
  const links: string[] = [];
  for (const tag of withoutComments.matchAll(/<(?:a|area)\b((?:[^>"']|"[^"]*"|'[^']*')*)>/gi)) {
    for (const attribute of (tag[1] ?? "").matchAll(/([^\s"'>/=]+)(?:\s*=\s*(?:"([^"]*)"|'([^']*)'|([^\s"'>]+)))?/g)) {
      if (attribute[1]?.toLowerCase() !== "href") continue;
      const value = attribute[2] ?? attribute[3] ?? attribute[4];
      if (value !== undefined) links.push(decodeEntities(value).trim());
      break;
    }
  }
  return links;
}

function decodeEntities(value: string): string {
  return value.replace(/&(#x[0-9a-f]+|#[0-9]+|[a-z]+);/gi, (entity, body: string) => {
    if (body.startsWith("#")) {
      const codePoint = body[1] === "x" || body[1] === "X" ? parseInt(body.slice(2), 16) : parseInt(body.slice(1), 10);
      return codePoint > 0 && codePoint <= 0x10ffff ? String.fromCodePoint(codePoint) : entity;
    }
    return NAMED_ENTITIES[body.toLowerCase()] ?? entity;
  });
}
