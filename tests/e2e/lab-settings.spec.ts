import { expect, test, type Page } from "@playwright/test";
import { demoPort } from "./support/ports";

const demo = `http://localhost:${demoPort}`;

async function signInAs(page: Page, role: "Host" | "Admin") {
  await page.goto(`${demo}/sign-in`);
  await page.getByRole("button", { name: new RegExp(`, ${role}$`) }).click();
  await page.waitForURL(/\/lab/);
}

test("only an admin reaches the lab settings", async ({ page }) => {
  await signInAs(page, "Host");
  await page.goto(`${demo}/lab/settings`);
  await expect(page).toHaveURL(/\/forbidden\?needs=admin/);
});

test("an admin's bad value is refused with its field named and kept as typed; a good one saves", async ({ page }) => {
  await signInAs(page, "Admin");
  await page.goto(`${demo}/lab/settings`);
  const labour = page.getByLabel("Labour rate");
  await labour.fill("thirty");
  await page.getByRole("button", { name: "Save settings" }).click();
  await expect(page.getByText("Labour rate: enter an amount like 12.50.")).toBeVisible();
  await expect(labour).toHaveValue("thirty");

  await labour.fill("36.50");
  await page.getByRole("button", { name: "Save settings" }).click();
  await expect(page.getByText("Saved. New estimates use these rates.")).toBeVisible();
  await page.reload();
  await expect(page.getByLabel("Labour rate")).toHaveValue("36.50");
});
