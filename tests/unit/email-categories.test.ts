import { describe, expect, it } from "vitest";
import { templateNames } from "@/emails/registry";
import { emailCategories, emailCategoryOf, hasEmailCategory, optionalEmailCategories, templateCategories } from "@/lib/email/categories";

describe("e-mail categories", () => {
  it("gives every registered template a category", () => {
    const missing = templateNames.filter((name) => !hasEmailCategory(name));
    expect(missing, `add these templates to lib/email/categories.ts: ${missing.join(", ")}`).toEqual([]);
  });

  it("covers the sign-in link and the templates the issue lists, registered yet or not", () => {
    // Issue 7 ("E-mail"): sign-in link, pledge receipt, campaign funded, lapsed and refunded, withdrawn and
    // refunded, scheduled with date, date slipped, lab note, report published, membership receipt.
    const listed = [
      "sign-in-link",
      "pledge-receipt",
      "campaign-funded",
      "campaign-lapsed-refund",
      "campaign-withdrawn-refund",
      "campaign-scheduled",
      "campaign-date-slipped",
      "lab-note",
      "report-published",
      "membership-receipt",
      "membership-renewal-failed",
    ];
    expect(listed.filter((name) => !hasEmailCategory(name))).toEqual([]);
  });

  it("keeps mail about a person's own sign-in and money always sent, and the rest optional", () => {
    for (const name of ["sign-in-link", "pledge-receipt", "campaign-lapsed-refund", "campaign-withdrawn-refund", "membership-receipt", "membership-renewal-failed"]) {
      expect(emailCategoryOf(name), name).toBe("account");
    }
    expect(emailCategoryOf("report-published")).toBe("reports");
    expect(emailCategoryOf("lab-note")).toBe("campaign-updates");
    expect(optionalEmailCategories).not.toContain("account");
    expect(new Set(Object.values(templateCategories))).toEqual(new Set(emailCategories));
  });
});
