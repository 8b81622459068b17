import { expect, test, type Page } from "@playwright/test";
import { demoPort } from "./support/ports";

const demo = `http://localhost:${demoPort}`;
// db/seed-reports.ts: the queued ASA campaign has a report draft; db/seed-data.ts names it.
const draftTitle = "ASA corner lift in the Heron";
const draftSlug = "asa-corner-lift-in-the-heron";

async function signInAsHost(page: Page) {
  await page.goto(`${demo}/sign-in`);
  await page.getByRole("button", { name: /, Host$/ }).click();
  await page.waitForURL(/\/lab/);
}

test.describe.configure({ mode: "serial" });

test("a host publishes the seeded report draft", async ({ page }) => {
  await signInAsHost(page);
  await page.goto(`${demo}/lab/reports`);
  const row = page.getByRole("row", { name: new RegExp(draftTitle) });
  await expect(row).toContainText("Draft");
  await row.getByRole("link", { name: "Edit report and notes" }).click();
  await expect(page.getByRole("heading", { name: draftTitle })).toBeVisible();

  // The preview shows markdown as backers will see it, and raw HTML only as text.
  const body = page.locator('textarea[name="bodyMd"]');
  await body.fill(`${await body.inputValue()}\n\n<script>window.__injected = true</script>`);
  await expect(page.getByTestId("write-up-preview")).toContainText("<script>window.__injected = true</script>");

  await page.getByLabel("Surface, ASA sample A (grey, UV-stabilised)").selectOption("1");
  await page.getByRole("button", { name: "Save draft" }).click();
  await expect(page.getByText("Draft saved.")).toBeVisible();

  page.once("dialog", (dialog) => void dialog.accept());
  await page.getByRole("button", { name: "Publish report" }).click();
  await page.waitForURL(new RegExp(`/reports/${draftSlug}$`));
  await expect(page.getByRole("heading", { name: draftTitle })).toBeVisible();
  expect(await page.evaluate(() => (window as unknown as { __injected?: boolean }).__injected)).toBeUndefined();
});

test("a visitor sees the scorecard, and the feed lists the report", async ({ page, request }) => {
  await page.goto(`${demo}/reports/${draftSlug}`);
  const scorecard = page.getByTestId("scorecard");
  await expect(scorecard.getByRole("rowheader", { name: "Dimensional accuracy" })).toBeVisible();
  await expect(scorecard.getByRole("row", { name: /Dimensional accuracy/ })).toContainText("+1");
  await expect(scorecard.getByRole("row", { name: /Surface/ })).toContainText("+1");
  await expect(page.locator('link[rel="alternate"][type="application/atom+xml"]')).toHaveAttribute("href", /\/reports\/feed\.xml$/);

  const feed = await request.get(`${demo}/reports/feed.xml`);
  expect(feed.headers()["content-type"]).toMatch(/application\/atom\+xml/);
  const xml = await feed.text();
  expect(xml).toContain(`<title type="html"><![CDATA[${draftTitle}]]></title>`);
  expect(xml).toContain(`/reports/${draftSlug}`);

  await page.goto(`${demo}/reports`);
  await expect(page.getByRole("link", { name: draftTitle })).toBeVisible();
  await expect(page.getByRole("link", { name: "Atom feed" })).toHaveAttribute("href", "/reports/feed.xml");
});
