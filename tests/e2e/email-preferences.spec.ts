import { expect, test } from "@playwright/test";
import { plainPort } from "./support/ports";
import { SignInPage } from "./support/sign-in-page";

test("a supporter turns report mail off and on again; the choice survives a reload", async ({ page }) => {
  await new SignInPage(page, plainPort).signIn("supporter@harbor-street.example", "/account/email");
  await expect(page.getByRole("heading", { name: "E-mail settings" })).toBeVisible();
  const reports = page.getByTestId("email-pref-reports");
  await expect(reports).toBeChecked();
  await reports.uncheck();
  await page.getByRole("button", { name: "Save e-mail settings" }).click();
  await expect(page.getByRole("status")).toHaveText("Saved.");
  await page.reload();
  await expect(page.getByTestId("email-pref-reports")).not.toBeChecked();
  await expect(page.getByText("(always sent)")).toBeVisible();
  await page.getByTestId("email-pref-reports").check();
  await page.getByRole("button", { name: "Save e-mail settings" }).click();
  await expect(page.getByTestId("email-pref-reports")).toBeChecked();
});

test("an unsubscribe link with a forged token changes nothing and says so", async ({ page }) => {
  await page.goto("/api/email/unsubscribe?token=eyJ2IjoxLCJ1IjoieCIsImMiOiJyZXBvcnRzIn0.forged");
  await expect(page).toHaveURL(/\/email\/unsubscribe\?token=/);
  await expect(page.getByRole("heading", { name: "This link does not work" })).toBeVisible();
  await expect(page.getByRole("button", { name: /Unsubscribe/ })).toHaveCount(0);
});

test("hosts see the outbox with counts per state, including suppressed", async ({ page }) => {
  await new SignInPage(page, plainPort).signIn("host@harbor-street.example", "/lab/outbox");
  await expect(page.getByRole("heading", { name: "Outbox" })).toBeVisible();
  for (const state of ["queued", "sending", "sent", "failed", "suppressed"]) {
    await expect(page.getByTestId(`outbox-count-${state}`)).toBeVisible();
  }
});
