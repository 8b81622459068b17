import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { emailPreferencesFor, setEmailPreference } from "@/db/queries/email-preferences";
import { enqueueMail } from "@/db/queries/outbox";
import { outbox, users } from "@/db/schema";
import { signUnsubscribeToken } from "@/lib/email/unsubscribe-token";
import type { OutgoingMail } from "@/server/mailer";
import { drainOutbox } from "@/server/outbox-worker";
import { createTempDb } from "../helpers/temp-db";

const SECRET = "preferences-test-secret-0123456789";
process.env.AUTH_SECRET = SECRET;
const temp = createTempDb();
process.env.DATABASE_PATH = temp.file;
afterAll(() => temp.cleanup());

const links = { appUrl: "http://localhost:3000", unsubscribeSecret: SECRET };
const ada = { id: "user-ada", name: "Ada", email: "ada@backers.example" };
const ben = { id: "user-ben", name: "Ben", email: "ben@backers.example" };
temp.db.insert(users).values([ada, ben]).run();

let clock = Date.parse("2026-12-01T00:00:00Z");
const now = () => new Date(clock);

function queueReport(person: typeof ada, report: string) {
  enqueueMail(
    temp.db,
    {
      dedupeKey: `report-published:${report}:${person.id}`,
      toAddress: person.email,
      template: "report-published",
      subject: `Report ${report}`,
      payload: { name: person.name, campaignTitle: `Campaign ${report}`, summary: "Bridges held flat.", reportUrl: "http://localhost:3000/r" },
    },
    now(),
  );
}

function queueReceipt(person: typeof ada, pledge: string) {
  enqueueMail(
    temp.db,
    {
      dedupeKey: `pledge-receipt:${pledge}`,
      toAddress: person.email,
      template: "pledge-receipt",
      subject: `Receipt ${pledge}`,
      payload: { name: person.name, campaignTitle: "Campaign", amount: "$25", paidOn: "1 Dec 2026", pledgeId: pledge, campaignUrl: "http://x/c", pledgesUrl: "http://x/p" },
    },
    now(),
  );
}

async function drain(): Promise<OutgoingMail[]> {
  const sent: OutgoingMail[] = [];
  await drainOutbox(temp.db, async (mail) => void sent.push(mail), { domain: "proofbay.test", links, now });
  clock += 1_000;
  return sent;
}

const stateOf = (dedupeKey: string) => temp.db.select().from(outbox).where(eq(outbox.dedupeKey, dedupeKey)).get()?.state;

describe("e-mail preferences and headers", () => {
  it("records the recipient's account and the template's category when queuing, looked up by address", () => {
    queueReport(ada, "r1");
    const row = temp.db.select().from(outbox).where(eq(outbox.dedupeKey, "report-published:r1:user-ada")).get();
    expect(row).toMatchObject({ userId: ada.id, category: "reports", state: "queued" });
  });

  it("puts RFC 8058 List-Unsubscribe headers and a footer link on optional mail, none on account mail", async () => {
    queueReceipt(ada, "pl1");
    const sent = await drain();
    const report = sent.find((mail) => mail.subject === "Report r1")!;
    const receipt = sent.find((mail) => mail.subject === "Receipt pl1")!;
    // RFC 8058 §3.1: List-Unsubscribe with an https URI, List-Unsubscribe-Post: List-Unsubscribe=One-Click.
    const token = signUnsubscribeToken({ userId: ada.id, category: "reports" }, SECRET);
    const url = `http://localhost:3000/api/email/unsubscribe?token=${token}`;
    expect(report.headers?.["List-Unsubscribe"]).toBe(`<${url}>`);
    expect(report.headers?.["List-Unsubscribe-Post"]).toBe("List-Unsubscribe=One-Click");
    expect(report.text).toContain(url);
    expect(report.html).toContain(`href="${url}"`);
    expect(report.text).toContain("http://localhost:3000/account/email");
    expect(receipt.headers).not.toHaveProperty("List-Unsubscribe");
    expect(receipt.headers).not.toHaveProperty("List-Unsubscribe-Post");
    expect(receipt.text).toContain("It is always sent.");
    expect(receipt.text).not.toContain("/api/email/unsubscribe");
  });

  it("suppresses queued mail of a kind the person turned off after it was queued, and still sends their account mail", async () => {
    queueReport(ada, "r2");
    queueReport(ben, "r2");
    queueReceipt(ada, "pl2");
    setEmailPreference(temp.db, { userId: ada.id, category: "reports", enabled: false, via: "page", now: now() });
    const sent = await drain();
    expect(sent.map((mail) => mail.subject).sort()).toEqual(["Receipt pl2", "Report r2"]);
    expect(sent.find((mail) => mail.subject === "Report r2")?.to).toBe(ben.email);
    expect(stateOf("report-published:r2:user-ada")).toBe("suppressed");
    expect(stateOf("report-published:r2:user-ben")).toBe("sent");
  });

  it("sends again once the person turns the kind back on", async () => {
    setEmailPreference(temp.db, { userId: ada.id, category: "reports", enabled: true, via: "page", now: now() });
    queueReport(ada, "r3");
    expect((await drain()).map((mail) => mail.subject)).toEqual(["Report r3"]);
    expect(emailPreferencesFor(temp.db, ada.id).reports).toBe(true);
  });
});

describe("POST /api/email/unsubscribe (one click)", () => {
  type Handler = (request: Request, segment: { params: Promise<Record<string, string>> }) => Promise<Response>;
  let POST: Handler;
  let GET: (request: Request) => Response;
  beforeAll(async () => {
    ({ POST, GET } = (await import("@/app/api/email/unsubscribe/route")) as unknown as { POST: Handler; GET: (request: Request) => Response });
  });

  async function post(token: string, body = "List-Unsubscribe=One-Click") {
    const request = new Request(`http://localhost:3000/api/email/unsubscribe?token=${encodeURIComponent(token)}`, {
      method: "POST",
      headers: { "content-type": "application/x-www-form-urlencoded" },
      body,
    });
    const response = await POST(request, { params: Promise.resolve({}) });
    return { status: response.status, body: (await response.json()) as { error?: { code: string; fields?: Record<string, string> } } };
  }

  it("turns the category off at once, without sign-in, so mail queued before the click is not sent", async () => {
    queueReport(ben, "r4");
    const { status } = await post(signUnsubscribeToken({ userId: ben.id, category: "reports" }, SECRET));
    expect(status).toBe(200);
    expect(emailPreferencesFor(temp.db, ben.id)).toMatchObject({ reports: false, "campaign-updates": true });
    expect(await drain()).toEqual([]);
    expect(stateOf("report-published:r4:user-ben")).toBe("suppressed");
    // A mail client may retry the POST; the second one changes nothing further.
    expect((await post(signUnsubscribeToken({ userId: ben.id, category: "reports" }, SECRET))).status).toBe(200);
  });

  it("changes nothing for a forged token or one altered to name another person", async () => {
    const before = emailPreferencesFor(temp.db, ada.id);
    const forged = await post(signUnsubscribeToken({ userId: ada.id, category: "campaign-updates" }, "not-the-server-secret-0123"));
    expect(forged.status).toBe(400);
    expect(forged.body.error?.fields).toHaveProperty("token");
    const bensSignature = signUnsubscribeToken({ userId: ben.id, category: "campaign-updates" }, SECRET).split(".")[1];
    const adasPayload = Buffer.from(JSON.stringify({ v: 1, u: ada.id, c: "campaign-updates" })).toString("base64url");
    expect((await post(`${adasPayload}.${bensSignature}`)).status).toBe(400);
    expect((await post("")).status).toBe(400);
    expect(emailPreferencesFor(temp.db, ada.id)).toEqual(before);
    expect(emailPreferencesFor(temp.db, ben.id)["campaign-updates"]).toBe(true);
  });

  it("needs the RFC 8058 body, and a GET only leads to the confirmation page", async () => {
    const token = signUnsubscribeToken({ userId: ada.id, category: "funding" }, SECRET);
    const noBody = await post(token, "");
    expect(noBody.status).toBe(400);
    expect(noBody.body.error?.fields).toHaveProperty("List-Unsubscribe");
    const response = GET(new Request(`http://localhost:3000/api/email/unsubscribe?token=${token}`));
    expect(response.status).toBe(303);
    expect(new URL(response.headers.get("location")!).pathname).toBe("/email/unsubscribe");
    expect(emailPreferencesFor(temp.db, ada.id).funding).toBe(true);
  });

  it("answers 404 for a genuine token whose account is gone", async () => {
    expect((await post(signUnsubscribeToken({ userId: "user-deleted", category: "reports" }, SECRET))).status).toBe(404);
  });
});
