import { expect, test } from "@playwright/test";
import { demoPort } from "./support/ports";
import { SignInPage } from "./support/sign-in-page";

/*
 * Joining the Filament Club on the demo stack: the app at demoPort, the fake card processor three
 * ports above it with its webhook pointed at the app. Test card 4242 4242 4242 4242 succeeds
 * (Stripe's "Testing" documentation). Reel costs $12 a month (db/seed-data.ts PLANS). The
 * membership is made only by the webhook, so the membership page is reloaded until it shows.
 * Mateo (db/seed-data.ts backer b04) has no membership and no other spec signs in as him.
 */
test.use({ baseURL: `http://localhost:${demoPort}` });

const fakeProcessor = `http://localhost:${demoPort + 3}`;
const email = "mateo.okonkwo@backers.example";

test("a supporter joins Reel with 4242 on the processor's page and sees the membership active", async ({ page }) => {
  await new SignInPage(page, demoPort).signIn(email, "/club");
  await page.goto("/club");
  const reel = page.getByTestId("plan-reel");
  await expect(reel).toContainText("$12");
  await expect(reel).toContainText("8 proposal votes a month");
  await reel.getByRole("button", { name: "Join Reel" }).click();

  await page.waitForURL((url) => url.href.startsWith(`${fakeProcessor}/pay/`));
  await page.getByLabel("Card number").fill("4242 4242 4242 4242");
  await page.getByLabel("Expiry (MM / YY)").fill("12 / 34");
  await page.getByLabel("CVC").fill("123");
  await page.getByLabel("Name on card").fill("Mateo Okonkwo");
  await page.getByRole("button", { name: /^(Pay|Subscribe) / }).click();

  await page.waitForURL((url) => url.port === String(demoPort) && url.pathname === "/account/membership");
  await expect(async () => {
    await page.reload();
    await expect(page.getByTestId("membership")).toHaveAttribute("data-status", "active", { timeout: 1_000 });
  }).toPass({ timeout: 20_000 });
  await expect(page.getByTestId("membership")).toContainText("Reel, $12 a month");

  await page.goto("/account");
  await expect(page.getByTestId("account-role")).toHaveText("Filament Club member");
});
