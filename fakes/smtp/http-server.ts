import { createServer, type IncomingMessage, type Server, type ServerResponse } from "node:http";
import { renderInboxPage, renderMessagePage, renderNotFoundPage } from "./html-pages";
import type { MessageStore } from "./message-store";
import type { ReceptionStats } from "./receptions";
import type { MessageFilter } from "./types";

export interface HttpServerOptions {
  store: MessageStore;
  /** Shown on the empty inbox page; a function because the SMTP port is only known once it listens. */
  smtpAddress: () => string;
  receptions: () => ReceptionStats;
  /** Empties the store and the reception counts. */
  clear: () => void;
}

// Rendering 20,000 rows helps nobody; the JSON API still returns everything.
const PAGE_LIMIT = 200;

// The inherited policy also applies inside the srcdoc iframe: mail may load remote images and fonts, never scripts.
const HTML_CSP = [
  "default-src 'none'",
  "style-src 'unsafe-inline' https:",
  "img-src * data: blob:",
  "font-src * data:",
  "form-action 'self'",
  "frame-ancestors 'none'",
].join("; ");

class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
  ) {
    super(message);
  }
}

export function createHttpServer(options: HttpServerOptions): Server {
  return createServer((request, response) => {
    try {
      route(request, response, options);
    } catch (error) {
      const httpError = error instanceof HttpError ? error : new HttpError(500, "internal_error", String(error));
      sendJson(response, httpError.status, { error: { code: httpError.code, message: httpError.message } });
    }
  });
}

function route(request: IncomingMessage, response: ServerResponse, { store, smtpAddress, receptions, clear }: HttpServerOptions): void {
  const url = new URL(request.url ?? "/", "http://localhost");
  const method = request.method === "HEAD" ? "GET" : (request.method ?? "GET");
  const path = url.pathname;

  if (path === "/") {
    if (method !== "GET") return methodNotAllowed(response, "GET");
    const filterTo = (url.searchParams.get("to") ?? "").trim();
    const matching = store.list(filterTo ? { to: filterTo } : {});
    return sendHtml(response, 200, renderInboxPage({ messages: matching.slice(0, PAGE_LIMIT), matching: matching.length, filterTo, smtpAddress: smtpAddress() }));
  }

  if (path === "/clear") {
    if (method !== "POST") return methodNotAllowed(response, "POST");
    request.resume();
    clear();
    response.writeHead(303, { location: "/", "cache-control": "no-store" }).end();
    return;
  }

  const pageId = matchId(path, /^\/messages\/([^/]+)$/);
  if (pageId !== undefined) {
    if (method !== "GET") return methodNotAllowed(response, "GET");
    const message = store.get(pageId);
    if (!message) return sendHtml(response, 404, renderNotFoundPage(`There is no message with id ${pageId}. It may have been cleared.`));
    return sendHtml(response, 200, renderMessagePage(message));
  }

  if (path === "/api/health") {
    if (method !== "GET") return methodNotAllowed(response, "GET");
    return sendJson(response, 200, { ok: true, count: store.count });
  }

  if (path === "/api/messages") {
    if (method === "GET") return sendJson(response, 200, store.list(readFilter(url)));
    if (method === "DELETE") {
      clear();
      return sendJson(response, 200, { ok: true });
    }
    return methodNotAllowed(response, "GET, DELETE");
  }

  if (path === "/api/receptions") {
    if (method !== "GET") return methodNotAllowed(response, "GET");
    return sendJson(response, 200, receptions());
  }

  if (path === "/api/messages/latest") {
    if (method !== "GET") return methodNotAllowed(response, "GET");
    const message = store.latest(readFilter(url));
    if (!message) throw new HttpError(404, "not_found", describeMissing(url));
    return sendJson(response, 200, message);
  }

  const apiId = matchId(path, /^\/api\/messages\/([^/]+)$/);
  if (apiId !== undefined) {
    if (method !== "GET") return methodNotAllowed(response, "GET");
    const message = store.get(apiId);
    if (!message) throw new HttpError(404, "not_found", `No message with id ${apiId}`);
    return sendJson(response, 200, message);
  }

  if (path.startsWith("/api/")) throw new HttpError(404, "not_found", `No route for ${method} ${path}`);
  sendHtml(response, 404, renderNotFoundPage(`Nothing lives at ${path}.`));
}

/** `?to=`, `?since=` (ISO) and `?subject=` (substring, case-insensitive). */
function readFilter(url: URL): MessageFilter {
  const filter: MessageFilter = {};
  const to = url.searchParams.get("to")?.trim();
  const since = url.searchParams.get("since")?.trim();
  const subject = url.searchParams.get("subject");
  if (to) filter.to = to;
  if (since) {
    if (Number.isNaN(Date.parse(since))) throw new HttpError(400, "invalid_request", `"since" must be an ISO timestamp, got "${since}"`);
    filter.since = since;
  }
  if (subject) filter.subjectIncludes = subject;
  return filter;
}

function describeMissing(url: URL): string {
  const criteria = ["to", "since", "subject"]
    .map((name) => [name, url.searchParams.get(name)] as const)
    .filter(([, value]) => value)
    .map(([name, value]) => `${name}=${value}`);
  return criteria.length > 0 ? `No message matches ${criteria.join(", ")}` : "The inbox is empty";
}

function matchId(path: string, pattern: RegExp): string | undefined {
  const raw = pattern.exec(path)?.[1];
  if (raw === undefined) return undefined;
  try {
    return decodeURIComponent(raw);
  } catch {
    return undefined;
  }
}

function methodNotAllowed(response: ServerResponse, allow: string): void {
  response.setHeader("allow", allow);
  sendJson(response, 405, { error: { code: "method_not_allowed", message: `Use ${allow}` } });
}

function sendJson(response: ServerResponse, status: number, body: unknown): void {
  const payload = JSON.stringify(body);
  response.writeHead(status, {
    "content-type": "application/json; charset=utf-8",
    "content-length": Buffer.byteLength(payload),
    "cache-control": "no-store",
  });
  response.end(payload);
}

function sendHtml(response: ServerResponse, status: number, html: string): void {
  response.writeHead(status, {
    "content-type": "text/html; charset=utf-8",
    "content-length": Buffer.byteLength(html),
    "cache-control": "no-store",
    "content-security-policy": HTML_CSP,
    "referrer-policy": "no-referrer",
    "x-content-type-options": "nosniff",
  });
  response.end(html);
}
