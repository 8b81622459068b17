import { describe, expect, it } from "vitest";
import { templateElement } from "@/emails/registry";
import { renderEmail } from "@/emails/render";

/* The two Filament Club mails render with an HTML and a plain-text part that carry the facts a member needs. */

describe("membership e-mails", () => {
  it("the receipt names the plan, the amount, the paid period and the cancel page, first month and renewal alike", async () => {
    const props = {
      name: "Mateo Okonkwo",
      planName: "Reel",
      amount: "$12",
      paidOn: "Jan 31, 2027",
      periodEnd: "Feb 28, 2027",
      renewal: false,
      invoiceRef: "9F3A1C2B-0001",
      monthlyVotes: 8,
      earlyBlindPairs: true,
      membershipUrl: "http://proofbay.test/account/membership",
    };
    const first = await renderEmail(templateElement("membership-receipt", props));
    expect(first.text).toContain("WELCOME TO THE FILAMENT CLUB"); // headings are upper-cased in the text part
    expect(first.text).toMatch(/\$12 was\s+paid on Jan 31, 2027/);
    expect(first.text).toContain("runs until Feb 28, 2027");
    expect(first.text).toContain("8 proposal votes a month");
    expect(first.text).toContain("http://proofbay.test/account/membership");
    expect(first.html).toContain("9F3A1C2B-0001");
    const renewal = await renderEmail(templateElement("membership-receipt", { ...props, renewal: true }));
    expect(renewal.text).toContain("YOUR MEMBERSHIP RENEWED");
  });

  it("the renewal-failed mail says the perks are paused and when the card is tried again", async () => {
    const mail = await renderEmail(
      templateElement("membership-renewal-failed", {
        name: null,
        planName: "Spool",
        amount: "$5",
        failedOn: "Mar 31, 2027",
        nextAttemptOn: "Apr 3, 2027",
        invoiceRef: "9F3A1C2B-0003",
        membershipUrl: "http://proofbay.test/account/membership",
      }),
    );
    expect(mail.text).toContain("Hello,");
    expect(mail.text).toMatch(/could not charge \$5 for your Filament Club Spool membership/);
    expect(mail.text).toContain("paused");
    expect(mail.text).toContain("around Apr 3, 2027");
  });
});
