import { createTransport } from "nodemailer";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startFakeInbox, type FakeInbox } from "@/fakes/smtp/inbox";

const mail = (messageId: string, subject: string) => ({
  from: "lab@proofbay.test",
  to: "ada@example.test",
  subject,
  text: "hello",
  messageId,
});

async function sendAll(inbox: FakeInbox, mails: ReturnType<typeof mail>[]) {
  const transport = createTransport({ host: "127.0.0.1", port: inbox.smtpPort, secure: false, ignoreTLS: true });
  for (const message of mails) await transport.sendMail(message);
  transport.close();
}

describe("fake inbox reception counts and Message-ID dedupe", () => {
  let plain: FakeInbox;
  let deduping: FakeInbox;
  beforeAll(async () => {
    plain = await startFakeInbox({ smtpPort: 0, httpPort: 0, quiet: true });
    deduping = await startFakeInbox({ smtpPort: 0, httpPort: 0, quiet: true, dedupeByMessageId: true });
  });
  afterAll(async () => {
    await plain?.close();
    await deduping?.close();
  });

  const twiceOnce = [mail("<one@proofbay.test>", "first"), mail("<one@proofbay.test>", "first again"), mail("<two@proofbay.test>", "second")];

  it("stores every copy by default and counts the repeat", async () => {
    await sendAll(plain, twiceOnce);
    expect(plain.messages().map((message) => message.subject)).toEqual(["second", "first again", "first"]);
    expect(plain.receptions()).toEqual({
      received: 3,
      suppressedDuplicates: 0,
      distinctMessageIds: 2,
      repeated: [{ messageId: "<one@proofbay.test>", count: 2 }],
    });
  });

  it("with dedupeByMessageId accepts a repeat but keeps only the first, and says so over HTTP", async () => {
    await sendAll(deduping, twiceOnce);
    expect(deduping.messages().map((message) => message.subject)).toEqual(["second", "first"]);
    const response = await fetch(`${deduping.url}/api/receptions`);
    expect(await response.json()).toEqual({
      received: 3,
      suppressedDuplicates: 1,
      distinctMessageIds: 2,
      repeated: [{ messageId: "<one@proofbay.test>", count: 2 }],
    });
    await fetch(`${deduping.url}/api/messages`, { method: "DELETE" });
    expect(deduping.receptions().received).toBe(0);
  });
});
