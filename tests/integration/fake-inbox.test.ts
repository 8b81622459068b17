import { mkdtemp, readFile, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import { createTransport } from "nodemailer";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { extractLinks, waitForMessage } from "@/fakes/smtp/client";
import { escapeHtml } from "@/fakes/smtp/escape-html";
import { startFakeInbox, type FakeInbox, type StoredMessage } from "@/fakes/smtp/inbox";

const SUBJECT = `Verify <your> email & "start" printing`;
const VERIFY_LINK = "https://proofbay.test/verify?token=abc123&next=%2Fprints";
const UNSUBSCRIBE = "<https://proofbay.test/unsubscribe?u=42&list=news>, <mailto:unsubscribe@proofbay.test>";
const SANDBOX = `sandbox="allow-popups allow-popups-to-escape-sandbox allow-top-navigation-by-user-activation"`;

function smtpTransport(port: number) {
  return createTransport({ host: "127.0.0.1", port, secure: false, ignoreTLS: true });
}

async function getJson<T>(url: string, init?: RequestInit): Promise<{ status: number; body: T }> {
  const response = await fetch(url, init);
  return { status: response.status, body: (await response.json()) as T };
}

async function savedSubjects(file: string): Promise<string[]> {
  try {
    const saved = JSON.parse(await readFile(file, "utf8")) as { messages: StoredMessage[] };
    return saved.messages.map((message) => message.subject);
  } catch {
    return [];
  }
}

function decodeAttribute(value: string): string {
  return value
    .replace(/&quot;/g, '"')
    .replace(/&#39;/g, "'")
    .replace(/&lt;/g, "<")
    .replace(/&gt;/g, ">")
    .replace(/&amp;/g, "&");
}

describe("fake SMTP inbox", () => {
  let dir: string;
  let storePath: string;
  let inbox: FakeInbox;
  let sentAt: string;
  let received: StoredMessage;

  beforeAll(async () => {
    dir = await mkdtemp(path.join(tmpdir(), "proofbay-fake-inbox-"));
    storePath = path.join(dir, "nested", "inbox.json");
    inbox = await startFakeInbox({ smtpPort: 0, httpPort: 0, storePath, quiet: true });
  });

  afterAll(async () => {
    await inbox?.close();
    await rm(dir, { recursive: true, force: true });
  });

  it("listens on real ports when asked for port 0", async () => {
    expect(inbox.smtpPort).toBeGreaterThan(0);
    expect(inbox.httpPort).toBeGreaterThan(0);
    expect(inbox.smtpPort).not.toBe(inbox.httpPort);
    expect(inbox.url).toBe(`http://localhost:${inbox.httpPort}`);
    expect(await getJson(`${inbox.url}/api/health`)).toEqual({ status: 200, body: { ok: true, count: 0 } });
  });

  it("stores a multipart mail and serves it from the JSON API", async () => {
    sentAt = new Date().toISOString();
    const transport = smtpTransport(inbox.smtpPort);
    await transport.sendMail({
      from: "Proofbay <hello@proofbay.test>",
      to: "Ada Lovelace <ada@example.test>",
      bcc: "audit@example.test",
      subject: SUBJECT,
      text: `Confirm your address: ${VERIFY_LINK}`,
      html: `<!doctype html><html><body><p>Welcome to Proofbay.</p><!-- <a href="https://ignored.test/">old</a> --><p><a class="button" href="${escapeHtml(VERIFY_LINK)}">Verify email</a></p></body></html>`,
      headers: { "List-Unsubscribe": UNSUBSCRIBE, "List-Unsubscribe-Post": "List-Unsubscribe=One-Click" },
    });
    transport.close();

    const { status, body: list } = await getJson<StoredMessage[]>(`${inbox.url}/api/messages?to=ada@example.test`);
    expect(status).toBe(200);
    expect(list).toHaveLength(1);
    received = list[0]!;
    expect(received).toMatchObject({
      from: expect.stringContaining("hello@proofbay.test"),
      to: ["ada@example.test"],
      envelope: { from: "hello@proofbay.test", to: ["ada@example.test", "audit@example.test"] },
      subject: SUBJECT,
      text: `Confirm your address: ${VERIFY_LINK}`,
    });
    expect(received.html).toContain("Verify email");
    expect(Date.parse(received.receivedAt)).toBeGreaterThanOrEqual(Date.parse(sentAt));
    expect(received.receivedAt).toMatch(/^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d\.\d{3}Z$/);

    expect(received.headers["list-unsubscribe"]).toBe(UNSUBSCRIBE);
    expect(received.headers["list-unsubscribe-post"]).toBe("List-Unsubscribe=One-Click");
    expect(received.headers["message-id"]).toMatch(/^<.+@.+>$/);

    // Recipient matching is case-insensitive and includes Bcc (envelope) recipients.
    expect((await getJson<StoredMessage[]>(`${inbox.url}/api/messages?to=ADA@Example.test`)).body).toHaveLength(1);
    expect((await getJson<StoredMessage[]>(`${inbox.url}/api/messages?to=audit@example.test`)).body).toHaveLength(1);
    expect((await getJson<StoredMessage[]>(`${inbox.url}/api/messages?to=nobody@example.test`)).body).toEqual([]);
    expect(inbox.messages().map((message) => message.id)).toEqual([received.id]);
  });

  it("waitForMessage finds it and extractLinks decodes the link", async () => {
    const message = await waitForMessage(inbox.url, "ada@example.test", { since: sentAt, subjectIncludes: "VERIFY <your>" });
    expect(message.id).toBe(received.id);
    expect(extractLinks(message.html ?? "")).toEqual([VERIFY_LINK]);

    await expect(
      waitForMessage(inbox.url, "ada@example.test", { since: new Date(Date.now() + 60_000).toISOString(), timeoutMs: 300 }),
    ).rejects.toThrow(/No mail to ada@example\.test .*within 300 ms/);
    await expect(waitForMessage(inbox.url, "ada@example.test", { since: "not a date", timeoutMs: 2_000 })).rejects.toThrow(/400/);
  });

  it("renders the message page with escaped headers and a sandboxed srcdoc iframe", async () => {
    const response = await fetch(`${inbox.url}/messages/${received.id}`);
    expect(response.status).toBe(200);
    expect(response.headers.get("content-type")).toBe("text/html; charset=utf-8");
    const page = await response.text();

    expect(page).toContain(`<h1>${escapeHtml(SUBJECT)}</h1>`);
    expect(page).not.toContain("<your>");
    expect(page).toContain(escapeHtml(UNSUBSCRIBE));

    const iframe = /<iframe\b[^>]*>/.exec(page)?.[0] ?? "";
    expect(iframe).toContain(SANDBOX);
    const srcdoc = /\ssrcdoc="([^"]*)"/.exec(iframe)?.[1];
    expect(srcdoc).toBeDefined();
    // Decoding the attribute must give back exactly the mail's HTML: nothing leaked out of the quotes.
    expect(decodeAttribute(srcdoc ?? "")).toBe(`<base target="_blank">${received.html}`);
    expect(page).toContain(`<pre>${escapeHtml(received.text)}</pre>`);
  });

  it("lists the message on the inbox page, newest first, with a recipient filter", async () => {
    const transport = smtpTransport(inbox.smtpPort);
    await transport.sendMail({ from: "hello@proofbay.test", to: "grace@example.test", subject: "Your print is ready", text: "Ready." });
    transport.close();

    const page = await (await fetch(`${inbox.url}/`)).text();
    expect(page).toContain("Proofbay fake inbox");
    expect(page).toContain("nothing leaves this machine");
    expect(page).toContain(`<a href="/messages/${received.id}">${escapeHtml(SUBJECT)}</a>`);
    expect(page.indexOf("Your print is ready")).toBeLessThan(page.indexOf(escapeHtml(SUBJECT)));

    const filtered = await (await fetch(`${inbox.url}/?to=grace%40example.test`)).text();
    expect(filtered).toContain("Your print is ready");
    expect(filtered).not.toContain(escapeHtml(SUBJECT));
    expect(filtered).toContain('value="grace@example.test"');
  });

  it("keeps messages across a restart with the same store file", async () => {
    // Written on a short timer while running, not only on close.
    await expect.poll(() => savedSubjects(storePath), { timeout: 3_000 }).toEqual([SUBJECT, "Your print is ready"]);
    await inbox.close();
    expect(await savedSubjects(storePath)).toEqual([SUBJECT, "Your print is ready"]);

    inbox = await startFakeInbox({ smtpPort: 0, httpPort: 0, storePath, quiet: true });
    const { status, body } = await getJson<StoredMessage>(`${inbox.url}/api/messages/latest?to=ada@example.test`);
    expect(status).toBe(200);
    expect(body).toEqual(received);

    const transport = smtpTransport(inbox.smtpPort);
    await transport.sendMail({ from: "hello@proofbay.test", to: "ada@example.test", subject: "After restart", text: "Hi" });
    transport.close();
    const ids = inbox.messages().map((message) => Number(message.id));
    expect(new Set(ids).size).toBe(3);
    expect(ids[0]).toBeGreaterThan(Math.max(...ids.slice(1)));
  });

  it("DELETE /api/messages clears the inbox, also on disk", async () => {
    const response = await fetch(`${inbox.url}/api/messages`, { method: "DELETE" });
    expect(response.status).toBe(200);
    expect((await getJson(`${inbox.url}/api/health`)).body).toEqual({ ok: true, count: 0 });
    expect(await getJson(`${inbox.url}/api/messages/latest?to=ada@example.test`)).toEqual({
      status: 404,
      body: { error: { code: "not_found", message: expect.any(String) } },
    });

    await inbox.close();
    inbox = await startFakeInbox({ smtpPort: 0, httpPort: 0, storePath, quiet: true });
    expect(inbox.messages()).toEqual([]);
  });

  it("POST /clear empties the inbox and redirects home", async () => {
    const transport = smtpTransport(inbox.smtpPort);
    await transport.sendMail({ from: "hello@proofbay.test", to: "ada@example.test", subject: "To be cleared", text: "x" });
    transport.close();
    expect(inbox.messages()).toHaveLength(1);

    const response = await fetch(`${inbox.url}/clear`, { method: "POST", redirect: "manual" });
    expect(response.status).toBe(303);
    expect(response.headers.get("location")).toBe("/");
    expect(inbox.messages()).toEqual([]);
  });

  it("answers 404 for unknown ids and routes", async () => {
    const page = await fetch(`${inbox.url}/messages/999999`);
    expect(page.status).toBe(404);
    expect(await page.text()).toContain("Not found");

    expect(await getJson(`${inbox.url}/api/messages/999999`)).toEqual({
      status: 404,
      body: { error: { code: "not_found", message: expect.any(String) } },
    });
    expect((await fetch(`${inbox.url}/no-such-page`)).status).toBe(404);
    expect((await getJson(`${inbox.url}/api/nope`)).status).toBe(404);
    expect((await fetch(`${inbox.url}/api/health`, { method: "POST" })).status).toBe(405);
  });
});

describe("fake SMTP inbox limits", () => {
  it("rejects messages over the size limit with 552", async () => {
    const inbox = await startFakeInbox({ smtpPort: 0, httpPort: 0, quiet: true, maxMessageBytes: 16 * 1024 });
    try {
      const transport = smtpTransport(inbox.smtpPort);
      await expect(
        transport.sendMail({ from: "a@proofbay.test", to: "b@example.test", subject: "Huge", text: "x".repeat(64 * 1024) }),
      ).rejects.toMatchObject({ responseCode: 552 });
      await transport.sendMail({ from: "a@proofbay.test", to: "b@example.test", subject: "Small", text: "ok" });
      transport.close();
      expect(inbox.messages().map((message) => message.subject)).toEqual(["Small"]);
    } finally {
      await inbox.close();
    }
  });

  it("drops the oldest messages beyond maxMessages", async () => {
    const inbox = await startFakeInbox({ smtpPort: 0, httpPort: 0, quiet: true, maxMessages: 3 });
    try {
      const transport = smtpTransport(inbox.smtpPort);
      for (let i = 1; i <= 5; i++) {
        await transport.sendMail({ from: "a@proofbay.test", to: "b@example.test", subject: `#${i}`, text: "x" });
      }
      transport.close();
      expect(inbox.messages().map((message) => message.subject)).toEqual(["#5", "#4", "#3"]);
      expect((await fetch(`${inbox.url}/messages/1`)).status).toBe(404);
    } finally {
      await inbox.close();
    }
  });

  // Slow-ish on purpose of nodemailer, not the inbox: it leaves Nagle on, so each message on a
  // kept-alive connection waits ~40 ms for a delayed ACK.
  it("stores exactly 500 messages sent in parallel over a few connections", async () => {
    const dir = await mkdtemp(path.join(tmpdir(), "proofbay-fake-inbox-bulk-"));
    const storePath = path.join(dir, "inbox.json");
    const inbox = await startFakeInbox({ smtpPort: 0, httpPort: 0, storePath, quiet: true });
    try {
      const transport = createTransport({
        host: "127.0.0.1",
        port: inbox.smtpPort,
        secure: false,
        ignoreTLS: true,
        pool: true,
        maxConnections: 4,
        maxMessages: Infinity,
      });
      const subjects = Array.from({ length: 500 }, (_, i) => `Bulk ${i}`);
      await Promise.all(
        subjects.map((subject, i) =>
          transport.sendMail({
            from: "bulk@proofbay.test",
            to: `user${i % 7}@example.test`,
            subject,
            text: `Message ${i}`,
            html: `<p>Message <a href="https://proofbay.test/m/${i}?a=1&amp;b=2">${i}</a></p>`,
          }),
        ),
      );
      transport.close();

      const stored = inbox.messages();
      expect(stored).toHaveLength(500);
      expect(new Set(stored.map((message) => message.id)).size).toBe(500);
      expect(new Set(stored.map((message) => message.subject))).toEqual(new Set(subjects));
      expect((await getJson(`${inbox.url}/api/health`)).body).toEqual({ ok: true, count: 500 });
      expect((await getJson<StoredMessage[]>(`${inbox.url}/api/messages?to=user3@example.test`)).body).toHaveLength(71);

      await inbox.close();
      const saved = await savedSubjects(storePath);
      expect(saved).toHaveLength(500);
      expect(new Set(saved)).toEqual(new Set(subjects));
    } finally {
      await inbox.close();
      await rm(dir, { recursive: true, force: true });
    }
  }, 30_000);
});

describe("extractLinks", () => {
  it("returns <a>/<area> hrefs in order with entities decoded", () => {
    const html = `
      <link rel="stylesheet" href="https://fonts.test/css">
      <a href="https://a.test/?x=1&amp;y=2">one</a>
      <A class="btn" HREF='https://b.test/?q=&#38;&#x26;'>two</A>
      <a href=https://c.test/plain>three</a>
      <!-- <a href="https://commented.test/">no</a> -->
      <a name="anchor">no href</a>
      <area href=" https://d.test/map " alt="">
      <abbr title="x">not a link</abbr>`;
    expect(extractLinks(html)).toEqual([
      "https://a.test/?x=1&y=2",
      "https://b.test/?q=&&",
      "https://c.test/plain",
      "https://d.test/map",
    ]);
  });
});
