import { escapeHtml } from "./escape-html";
import type { StoredMessage } from "./types";

export interface InboxPageView {
  messages: readonly StoredMessage[];
  matching: number;
  filterTo: string;
  smtpAddress: string;
}

const STYLES = `
:root { color-scheme: light; --ink: #1d2433; --paper: #f6f4ef; --card: #fffdf9; --accent: #0f766e; --muted: #545d6b; --line: #dcd6ca; }
* { box-sizing: border-box; }
body { margin: 0; background: var(--paper); color: var(--ink); font: 16px/1.5 system-ui, -apple-system, "Segoe UI", Roboto, "Helvetica Neue", Arial, sans-serif; }
main { max-width: 64rem; margin: 0 auto; padding: 2rem 1.25rem 4rem; }
h1 { font-size: 1.75rem; line-height: 1.2; margin: 0 0 .75rem; overflow-wrap: anywhere; }
h2 { font-size: 1.125rem; margin: 2rem 0 .5rem; }
a { color: var(--accent); text-underline-offset: .15em; }
a:hover { text-decoration-thickness: 2px; }
:focus-visible { outline: 3px solid var(--accent); outline-offset: 2px; border-radius: 2px; }
.notice { margin: 0 0 1.5rem; padding: .75rem 1rem; background: var(--card); border: 1px solid var(--line); border-left: 4px solid var(--accent); border-radius: 6px; }
.toolbar { display: flex; flex-wrap: wrap; gap: 1rem; align-items: flex-end; justify-content: space-between; margin-bottom: 1rem; }
.toolbar form { display: flex; flex-wrap: wrap; gap: .5rem; align-items: flex-end; margin: 0; }
.field { display: flex; flex-direction: column; gap: .25rem; }
label { font-weight: 600; font-size: .875rem; }
input { font: inherit; min-width: 16rem; padding: .4rem .6rem; color: var(--ink); background: #fff; border: 1px solid #7d8591; border-radius: 6px; }
button { font: inherit; font-weight: 600; padding: .45rem 1rem; border-radius: 6px; border: 1px solid var(--accent); background: var(--accent); color: #fff; cursor: pointer; }
button.secondary { background: transparent; color: var(--accent); }
.count { color: var(--muted); margin: 0 0 .5rem; }
table { width: 100%; border-collapse: collapse; background: var(--card); border: 1px solid var(--line); border-radius: 6px; }
caption { text-align: left; position: absolute; width: 1px; height: 1px; overflow: hidden; clip-path: inset(50%); }
th, td { text-align: left; vertical-align: top; padding: .55rem .75rem; border-bottom: 1px solid var(--line); }
th { font-size: .8125rem; letter-spacing: .02em; text-transform: uppercase; color: var(--muted); }
td { overflow-wrap: anywhere; }
td.time { white-space: nowrap; color: var(--muted); font-variant-numeric: tabular-nums; }
.empty { padding: 2rem 1rem; text-align: center; background: var(--card); border: 1px dashed var(--line); border-radius: 6px; }
dl { display: grid; grid-template-columns: max-content 1fr; gap: .35rem 1.25rem; margin: 0; padding: 1rem; background: var(--card); border: 1px solid var(--line); border-radius: 6px; }
dt { color: var(--muted); font-weight: 600; }
dd { margin: 0; overflow-wrap: anywhere; }
iframe { display: block; width: 100%; height: 36rem; resize: vertical; overflow: auto; background: #fff; border: 1px solid var(--line); border-radius: 6px; }
pre { margin: 0; padding: 1rem; white-space: pre-wrap; overflow-wrap: anywhere; font: .875rem/1.55 ui-monospace, SFMono-Regular, Menlo, Consolas, monospace; background: var(--card); border: 1px solid var(--line); border-radius: 6px; }
details { margin-top: 2rem; }
summary { cursor: pointer; font-weight: 600; }
details table { margin-top: .5rem; font-size: .875rem; }
.muted { color: var(--muted); }
`;

const NOTICE =
  "This is a local stand-in for a mail provider. Mail sent to its SMTP port is kept here for you to read; nothing is delivered and nothing leaves this machine.";

export function renderInboxPage(view: InboxPageView): string {
  const filter = view.filterTo;
  const countText =
    view.matching === view.messages.length
      ? `${view.matching} ${view.matching === 1 ? "message" : "messages"}${filter ? ` to ${filter}` : ""}, newest first.`
      : `Showing the newest ${view.messages.length} of ${view.matching} messages${filter ? ` to ${filter}` : ""}.`;

  const list =
    view.messages.length === 0
      ? `<p class="empty">${
          filter
            ? `No mail to ${escapeHtml(filter)} yet.`
            : `No mail yet. Send some to SMTP on <code>${escapeHtml(view.smtpAddress)}</code>.`
        }</p>`
      : `<table>
  <caption>Received mail, newest first</caption>
  <thead><tr><th scope="col">Received</th><th scope="col">To</th><th scope="col">Subject</th></tr></thead>
  <tbody>
${view.messages.map(renderRow).join("\n")}
  </tbody>
</table>`;

  return layout(
    "Proofbay fake inbox",
    `<h1>Proofbay fake inbox</h1>
<p class="notice">${escapeHtml(NOTICE)}</p>
<div class="toolbar">
  <form method="get" action="/" role="search">
    <div class="field">
      <label for="to">Recipient address</label>
      <input id="to" name="to" type="text" inputmode="email" autocomplete="off" spellcheck="false" value="${escapeHtml(filter)}">
    </div>
    <button type="submit">Filter</button>
    ${filter ? `<a href="/">Show all mail</a>` : ""}
  </form>
  <form method="post" action="/clear">
    <button type="submit" class="secondary">Clear all</button>
  </form>
</div>
<p class="count" aria-live="polite">${escapeHtml(countText)} <a href="${filter ? `/?to=${encodeURIComponent(filter)}` : "/"}">Refresh</a></p>
${list}`,
  );
}

function renderRow(message: StoredMessage): string {
  const to = message.to.length > 0 ? message.to : message.envelope.to;
  return `    <tr>
      <td class="time">${renderTime(message.receivedAt)}</td>
      <td>${escapeHtml(to.join(", "))}</td>
      <td><a href="/messages/${encodeURIComponent(message.id)}">${escapeHtml(message.subject || "(no subject)")}</a></td>
    </tr>`;
}

export function renderMessagePage(message: StoredMessage): string {
  const details: Array<[string, string]> = [
    ["From", message.from],
    ["To", message.to.join(", ")],
    ["Cc", message.cc.join(", ")],
    // Only differs from To/Cc for Bcc recipients, which is exactly when it is worth showing.
    ["Envelope to", sameAddresses(message.envelope.to, [...message.to, ...message.cc]) ? "" : message.envelope.to.join(", ")],
    ["Message-ID", message.headers["message-id"] ?? ""],
    ["List-Unsubscribe", message.headers["list-unsubscribe"] ?? ""],
    ["List-Unsubscribe-Post", message.headers["list-unsubscribe-post"] ?? ""],
    ["Attachments", message.attachments.map((a) => `${a.filename ?? "(unnamed)"} (${a.contentType}, ${a.size} bytes)`).join("; ")],
  ];

  // Links open in a new tab: many sites refuse to be framed, and the sandbox lets popups escape it.
  const htmlBody =
    message.html === null
      ? `<p class="muted">This message has no HTML part.</p>`
      : `<iframe title="HTML body of “${escapeHtml(message.subject)}”" sandbox="allow-popups allow-popups-to-escape-sandbox allow-top-navigation-by-user-activation" referrerpolicy="no-referrer" srcdoc="${escapeHtml(`<base target="_blank">${message.html}`)}"></iframe>`;

  const textBody = message.text ? `<pre>${escapeHtml(message.text)}</pre>` : `<p class="muted">This message has no plain-text part.</p>`;

  const headerRows = Object.entries(message.headers)
    .map(([name, value]) => `<tr><th scope="row">${escapeHtml(name)}</th><td>${escapeHtml(value)}</td></tr>`)
    .join("\n");

  return layout(
    `${message.subject || "(no subject)"} · Proofbay fake inbox`,
    `<p><a href="/">← Back to the inbox</a></p>
<h1>${escapeHtml(message.subject || "(no subject)")}</h1>
<dl>
  <dt>Received</dt><dd>${renderTime(message.receivedAt)}</dd>
${details
  .filter(([, value]) => value !== "")
  .map(([label, value]) => `  <dt>${escapeHtml(label)}</dt><dd>${escapeHtml(value)}</dd>`)
  .join("\n")}
</dl>
<h2>HTML</h2>
${htmlBody}
<h2>Plain text</h2>
${textBody}
<details>
  <summary>All headers</summary>
  <table>
${headerRows}
  </table>
</details>
<p><a href="/api/messages/${encodeURIComponent(message.id)}">This message as JSON</a></p>`,
  );
}

export function renderNotFoundPage(text: string): string {
  return layout("Not found · Proofbay fake inbox", `<h1>Not found</h1>\n<p>${escapeHtml(text)}</p>\n<p><a href="/">Back to the inbox</a></p>`);
}

function sameAddresses(a: readonly string[], b: readonly string[]): boolean {
  const normalize = (list: readonly string[]) => [...new Set(list.map((address) => address.toLowerCase()))].sort().join("\n");
  return normalize(a) === normalize(b);
}

function renderTime(iso: string): string {
  const readable = iso.replace("T", " ").replace(/\.\d+Z$|Z$/, " UTC");
  return `<time datetime="${escapeHtml(iso)}">${escapeHtml(readable)}</time>`;
}

function layout(title: string, body: string): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(title)}</title>
<style>${STYLES}</style>
</head>
<body>
<main>
${body}
</main>
</body>
</html>
`;
}
