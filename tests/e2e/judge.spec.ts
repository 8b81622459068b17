import { expect, test, type Page } from "@playwright/test";
import { demoPort } from "./support/ports";

/*
 * Blind-pair judging on the demo stack. The reported demo campaign is "Wide-mouth blower duct for
 * the Wren"; Mina (Reel member) backed it, Jules did not. Judging needs report photos: when the
 * seed has none, the member's test says so and stops.
 */
test.use({ baseURL: `http://localhost:${demoPort}` });

const judgePath = "/campaigns/wide-mouth-blower-duct-for-the-wren/judge";

async function signInAsDemo(page: Page, accessibleName: string) {
  await page.goto("/sign-in");
  await page.getByRole("button", { name: accessibleName }).click();
  await page.waitForURL((url) => !url.pathname.startsWith("/sign-in"));
}

test("a visitor is sent to sign in before judging", async ({ page }) => {
  await page.goto(judgePath);
  await expect(page).toHaveURL(/\/sign-in\?callbackUrl=%2Fcampaigns%2Fwide-mouth-blower-duct-for-the-wren%2Fjudge/);
});

test("a supporter who did not back the campaign cannot judge it", async ({ page }) => {
  await signInAsDemo(page, "Sign in as Jules Adeyemi-Hart, Supporter");
  await page.goto(judgePath);
  await expect(page.getByTestId("judge-refused")).toBeVisible();
  await expect(page.getByRole("button", { name: "Left is better" })).toHaveCount(0);
});

test("a backer judges a blind pair and moves on to the next", async ({ page }) => {
  await signInAsDemo(page, "Sign in as Mina Sato-Ferris, Filament Club member");
  await page.goto(judgePath);
  const refused = page.getByTestId("judge-refused");
  const progress = page.getByTestId("judge-progress");
  await expect(refused.or(progress)).toBeVisible();
  test.skip(await refused.isVisible(), "the demo report has no photos to pair");

  const before = Number((await progress.locator("strong").textContent()) ?? "0");
  const images = page.locator("figure img");
  await expect(images).toHaveCount(2);
  for (const src of await images.evaluateAll((nodes) => nodes.map((n) => (n as HTMLImageElement).getAttribute("src") ?? ""))) {
    expect(src).toMatch(/^\/api\/blind-pairs\/images\/[A-Za-z0-9_-]+$/);
  }
  // The server refuses votes faster than a person compares two photos (1.5 s).
  await page.waitForTimeout(1700);
  await page.getByRole("button", { name: "Left is better" }).click();
  await expect(progress.locator("strong")).toHaveText(String(before + 1));
});
