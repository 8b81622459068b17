import { expect, test, type Locator, type Page } from "@playwright/test";
import { demoPort } from "./support/ports";

const demo = `http://localhost:${demoPort}`;

async function signInAsHost(page: Page) {
  await page.goto(`${demo}/sign-in`);
  await page.getByRole("button", { name: /host$/i }).click();
  await page.waitForURL(/\/lab/);
}

const bars = (scope: Locator | Page) => scope.locator("[data-job-bar]");

async function notPlacedCount(page: Page): Promise<number> {
  const heading = await page.getByRole("heading", { name: /^Not placed/ }).textContent();
  return Number(/\((\d+)\)/.exec(heading ?? "")?.[1] ?? Number.NaN);
}

test.describe.configure({ mode: "serial" });

test("a host sees the queue, marks a printer down and sees its jobs move", async ({ page }) => {
  await signInAsHost(page);
  await page.getByRole("navigation", { name: "Lab" }).getByRole("link", { name: "Print queue" }).click();
  await expect(page.getByRole("heading", { name: "Print queue" })).toBeVisible();
  await expect(bars(page).first()).toBeVisible();

  // A printer with queued bars and nothing printing on it (a running job stays where it is).
  const rows = page.locator("[data-printer-row]");
  let row: Locator | null = null;
  for (let i = 0; i < (await rows.count()); i++) {
    const candidate = rows.nth(i);
    const labels = await bars(candidate).evaluateAll((nodes) => nodes.map((node) => node.getAttribute("aria-label") ?? ""));
    if (labels.length > 0 && labels.every((label) => !label.includes("printing"))) {
      row = candidate;
      break;
    }
  }
  expect(row, "a printer with queued jobs").not.toBeNull();
  const lane = row as Locator;
  const totalBefore = (await bars(page).count()) + (await notPlacedCount(page));

  await lane.getByRole("button", { name: /^Mark down/ }).click();
  await expect(page.getByRole("status")).toContainText("moved");
  await expect(lane.getByText("Down", { exact: true })).toBeVisible();
  await expect(bars(lane)).toHaveCount(0);
  // Moved to other printers or listed as not placed, never lost.
  await expect.poll(async () => (await bars(page).count()) + (await notPlacedCount(page))).toBe(totalBefore);

  await lane.getByRole("button", { name: /^Mark up/ }).click();
  await expect(lane.getByText("Available", { exact: true })).toBeVisible();
  await expect.poll(async () => bars(lane).count()).toBeGreaterThan(0);
});

test("a job's panel refuses a printer that cannot print it, with the reason", async ({ page }) => {
  await signInAsHost(page);
  await page.goto(`${demo}/lab/queue`);
  // The ASA campaign's jobs need an enclosed printer (db/seed-data.ts: only the Heron is enclosed).
  const asaBar = page.locator("[data-job-bar][aria-label^='ASA']").first();
  await asaBar.click();
  await page.getByLabel("Printer").selectOption({ label: "Bay 1 — Kestrel" });
  await expect(page.getByRole("alert").filter({ hasText: "cannot print" })).toContainText("ASA");
});
