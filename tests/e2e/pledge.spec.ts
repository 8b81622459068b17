import { expect, test, type Page } from "@playwright/test";
import { demoPort } from "./support/ports";

/*
 * The pledge path on the demo stack: the app at demoPort, the fake card processor three ports
 * above it with its webhook pointed at the app. Test cards: Stripe's "Testing" documentation
 * (4242 4242 4242 4242 succeeds, 4000 0000 0000 0002 is declined with "Your card was declined.").
 * The pledge is marked paid only by the webhook, so the account page is polled until it shows.
 */
test.describe.configure({ mode: "serial" });
test.use({ baseURL: `http://localhost:${demoPort}` });

const fakeProcessor = `http://localhost:${demoPort + 3}`;
const campaignSlug = "hardened-0-6-mm-nozzle-at-high-flow"; // seeded open campaign (db/seed-data.ts)
const campaignTitle = "Hardened 0.6 mm nozzle at high flow";

async function signInAsSupporter(page: Page) {
  await page.goto("/sign-in");
  await page.getByRole("button", { name: "Sign in as Jules Adeyemi-Hart, Supporter" }).click();
  await page.waitForURL((url) => !url.pathname.startsWith("/sign-in"));
}

async function payOnHostedPage(page: Page, card: string) {
  await page.waitForURL((url) => url.href.startsWith(`${fakeProcessor}/pay/`));
  await page.getByLabel("Card number").fill(card);
  await page.getByLabel("Expiry (MM / YY)").fill("12 / 34");
  await page.getByLabel("CVC").fill("123");
  await page.getByLabel("Name on card").fill("Jules Adeyemi-Hart");
  await page.getByRole("button", { name: /^Pay / }).click();
}

function paidRows(page: Page, amount: string) {
  return page.getByTestId("own-pledge").filter({ hasText: campaignTitle }).filter({ hasText: amount }).and(page.locator('[data-state="paid"]'));
}

test("a visitor is asked to sign in before pledging", async ({ page }) => {
  await page.goto(`/campaigns/${campaignSlug}`);
  await expect(page.getByRole("link", { name: "Sign in to pledge" })).toBeVisible();
  await expect(page.getByRole("button", { name: "Continue to payment" })).toHaveCount(0);
});

test("the supporter pledges $25, pays with 4242 on the processor's page and sees it confirmed", async ({ page }) => {
  await signInAsSupporter(page);
  await page.goto("/account/pledges");
  const before = await paidRows(page, "$25").count();

  await page.goto(`/campaigns/${campaignSlug}`);
  await expect(page.getByText("Between $5 and $1,000.")).toBeVisible();
  await expect(page.getByText(/defer to local law/).first()).toBeVisible();
  await page.getByRole("button", { name: "$25", exact: true }).click();
  await expect(page.getByLabel("Amount (USD)")).toHaveValue("25");
  await page.getByRole("button", { name: "Continue to payment" }).click();

  await payOnHostedPage(page, "4242 4242 4242 4242");
  await page.waitForURL((url) => url.port === String(demoPort) && url.pathname === `/campaigns/${campaignSlug}`);
  expect(new URL(page.url()).searchParams.get("pledge")).toBe("thanks");
  await expect(page.getByTestId("pledge-thanks")).toContainText(/Thank you — your pledge will appear once the payment is confirmed|Your pledge of \$25 is confirmed/);

  await expect(async () => {
    await page.goto("/account/pledges");
    expect(await paidRows(page, "$25").count()).toBe(before + 1);
  }).toPass({ timeout: 20_000, intervals: [250, 500, 1000] });
});

test("a too-small amount is refused beside the field; a declined card shows the decline on the processor's page", async ({ page }) => {
  await signInAsSupporter(page);
  await page.goto(`/campaigns/${campaignSlug}`);
  const amount = page.getByLabel("Amount (USD)");
  await amount.fill("2");
  await page.getByRole("button", { name: "Continue to payment" }).click();
  // By text: Next's route announcer is also a role="alert".
  await expect(page.getByText("Amount must be at least $5.", { exact: true })).toBeVisible();
  await expect(page).toHaveURL(new RegExp(`/campaigns/${campaignSlug}$`));

  await amount.fill("12");
  await page.getByRole("button", { name: "Continue to payment" }).click();
  await payOnHostedPage(page, "4000 0000 0000 0002");
  await expect(page.getByText("Your card was declined.", { exact: false })).toBeVisible();
  expect(page.url().startsWith(`${fakeProcessor}/pay/`)).toBe(true);
});
