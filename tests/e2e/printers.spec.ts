import { expect, test, type Page } from "@playwright/test";
import { demoPort } from "./support/ports";

const demo = `http://localhost:${demoPort}`;

async function signInAs(page: Page, role: "Host" | "Admin") {
  await page.goto(`${demo}/sign-in`);
  await page.getByRole("button", { name: new RegExp(`, ${role}$`) }).click();
  await page.waitForURL(/\/lab/);
}

/** "YYYY-MM-DDTHH:mm" for a datetime-local input; the page reads it in the lab's time zone. */
function localInput(daysAhead: number, hour: number): string {
  const date = new Date(Date.now() + daysAhead * 86_400_000);
  const pad = (n: number) => String(n).padStart(2, "0");
  return `${date.getUTCFullYear()}-${pad(date.getUTCMonth() + 1)}-${pad(date.getUTCDate())}T${pad(hour)}:00`;
}

test("a host is kept off the printers page", async ({ page }) => {
  await signInAs(page, "Host");
  await page.goto(`${demo}/lab/printers`);
  await expect(page).toHaveURL(/\/forbidden\?needs=admin/);
});

test("an admin adds a maintenance block, and a backwards one is refused with its field named", async ({ page }) => {
  await signInAs(page, "Admin");
  await page.goto(`${demo}/lab/printers`);
  await expect(page.getByRole("heading", { name: "At the printers" })).toBeVisible();
  const form = page.getByRole("form", { name: /^Add maintenance to / }).first();
  // A day far enough out (and varied) that reruns against the same database do not overlap.
  const day = 30 + Math.floor(Math.random() * 300);
  await form.getByLabel("From").fill(localInput(day, 9));
  await form.getByLabel("Until").fill(localInput(day, 7));
  await form.getByLabel("Reason").fill("Nozzle swap");
  await form.getByRole("button", { name: "Add block" }).click();
  await expect(form.getByText("The end must be after the start.")).toBeVisible();

  await form.getByLabel("Until").fill(localInput(day, 12));
  await form.getByRole("button", { name: "Add block" }).click();
  await expect(page.getByRole("status").filter({ hasText: /Maintenance block added/ })).toBeVisible();
  await expect(page.getByText("Nozzle swap").first()).toBeVisible();
});

test("a host logs a printing job as done, and logging it again changes nothing", async ({ page }) => {
  await signInAs(page, "Host");
  await page.goto(`${demo}/lab/jobs`);
  await expect(page.getByRole("heading", { name: "Before you start a print" })).toBeVisible();
  const printing = page.getByRole("row").filter({ has: page.getByRole("cell", { name: "Printing", exact: true }) }).first();
  await printing.getByRole("link").click();
  await expect(page.getByRole("heading", { name: /Printing — attempt/ })).toBeVisible();

  await page.getByLabel("Actual hours").fill("2.4");
  await page.getByLabel("Filament used (g)").fill("21.5");
  await page.getByLabel("Notes (optional)").fill("Logged from the e2e run");
  await page.getByRole("button", { name: "Log this run" }).click();
  await expect(page.getByRole("heading", { name: "Done", exact: true })).toBeVisible();
  const runs = page.getByRole("table", { name: "Attempts at this job" });
  await expect(runs.getByRole("row")).toHaveCount(2);
  await expect(runs).toContainText("2.40 h");
});
