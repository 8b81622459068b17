import { describe, expect, it } from "vitest";
import { templateElement } from "@/emails/registry";
import { renderEmail } from "@/emails/render";
import { formatDate } from "@/lib/format";

// 2026-12-10 03:00 UTC is still 9 December in the demo lab's zone (America/Chicago, UTC−6 in winter, per the IANA tz database).
const resultsAt = new Date(Date.UTC(2026, 11, 10, 3, 0));

describe("the backers' date mails", () => {
  it("give the scheduled date in the lab's time zone, in both parts", async () => {
    const resultsOn = formatDate(resultsAt, "America/Chicago");
    expect(resultsOn).toBe("Dec 9, 2026");
    const mail = await renderEmail(
      templateElement("campaign-scheduled", {
        name: "Ada",
        campaignTitle: "Ring duct vs stock",
        resultsOn,
        timeZone: "America/Chicago",
        jobs: 18,
        campaignUrl: "http://localhost:3000/campaigns/ring-duct",
      }),
    );
    for (const part of [mail.html, mail.text]) {
      expect(part).toContain("Dec 9, 2026");
      expect(part).toContain("America/Chicago");
      expect(part).toContain("18 prints");
    }
    expect(mail.text).toContain("http://localhost:3000/campaigns/ring-duct");
  });

  it("say old and new date and the reason when one is known", async () => {
    const props = {
      name: null,
      campaignTitle: "Ring duct vs stock",
      previousDate: "Dec 9, 2026",
      newDate: "Dec 14, 2026",
      timeZone: "America/Chicago",
      campaignUrl: "http://localhost:3000/campaigns/ring-duct",
    };
    const withReason = await renderEmail(templateElement("campaign-date-slipped", { ...props, reason: "Bay 2 is out of use for repair." }));
    expect(withReason.text).toMatch(/Dec 14, 2026[\s\S]*instead of Dec 9, 2026/);
    expect(withReason.text).toContain("Bay 2 is out of use for repair.");
    const without = await renderEmail(templateElement("campaign-date-slipped", { ...props, reason: null }));
    expect(without.text).not.toContain("Why:");
    expect(without.text).toContain("The print queue changed");
  });
});
