import { expect, test, type Page } from "@playwright/test";
import { waitForMessage } from "../../fakes/smtp/client";
import { inboxUrlFor } from "./support/inbox";
import { demoPort } from "./support/ports";

/*
 * Goal-or-refund on the demo stack: a host withdraws a seeded open campaign with a reason, and a
 * backer (Mina, whose pledge db/seed-data.ts places on it) gets the refund mail quoting the reason
 * and sees the pledge refunded. The seed's payments never went through the fake processor, so their
 * refunds are recorded as made outside it (lib/pledges/refunds.ts); the mail and states are the same.
 */
test.describe.configure({ mode: "serial" });
test.use({ baseURL: `http://localhost:${demoPort}` });

const campaignSlug = "twin-inlet-ring-duct-vs-stock";
const campaignTitle = "Twin-inlet ring duct vs stock on the Kestrel";
const backerEmail = "member@harbor-street.example";
const reason = "The Kestrel's hotend is out for repair until next season, so the lab cannot run this plan.";

async function signInAsDemo(page: Page, accessibleName: string | RegExp) {
  await page.goto("/sign-in");
  await page.getByRole("button", { name: accessibleName }).click();
  await page.waitForURL((url) => !url.pathname.startsWith("/sign-in"));
}

test("a host withdraws an open campaign with a reason; the backer is refunded and told why", async ({ page }) => {
  const since = new Date().toISOString();
  await signInAsDemo(page, /Sign in as .*, Host$/);
  await page.goto("/lab/campaigns");
  await page.getByRole("link", { name: campaignTitle }).click();
  await expect(page.getByRole("heading", { name: "Withdraw this campaign" })).toBeVisible();

  // Without a reason the form refuses and names the field (the server checks the same schema).
  const withdraw = page.getByRole("button", { name: /^Withdraw and refund/ });
  await withdraw.click();
  await expect(page.getByText(/Give the reason backers will read/)).toBeVisible();

  await page.getByLabel(/^Reason/).fill(reason);
  await withdraw.click();
  // The action refunds before it answers; the refreshed page then shows the closed campaign.
  await expect(page.getByTestId("refund-progress")).toContainText(/0 in progress · 0 need a look/, { timeout: 15_000 });
  await expect(page.getByText(reason)).toBeVisible();

  const mail = await waitForMessage(inboxUrlFor(demoPort), backerEmail, { since, subjectIncludes: "the lab withdrew", timeoutMs: 15_000 });
  expect(mail.text ?? "").toContain(reason);
  expect(mail.text ?? "").toMatch(/was refunded in full/);

  await page.goto(`/campaigns/${campaignSlug}`);
  await expect(page.getByTestId("campaign-closed")).toContainText(reason);
});

test("the backer's pledges page shows the refund and why", async ({ page }) => {
  await signInAsDemo(page, "Sign in as Mina Sato-Ferris, Filament Club member");
  await page.goto("/account/pledges");
  const row = page.getByTestId("own-pledge").filter({ hasText: campaignTitle });
  await expect(row).toHaveAttribute("data-state", "refunded");
  await expect(row.getByTestId("own-pledge-refund")).toContainText("Campaign withdrawn");
});
