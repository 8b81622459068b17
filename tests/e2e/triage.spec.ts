import { expect, test, type Page } from "@playwright/test";
import { inboxUrlFor } from "./support/inbox";
import { demoPort } from "./support/ports";

const demo = `http://localhost:${demoPort}`;
// Proposers of the seeded submitted proposals (db/seed-data.ts: b21 and b13).
const sheetProposer = "ingrid.oyelaran@backers.example";

async function signInAsHost(page: Page) {
  await page.goto(`${demo}/sign-in`);
  await page.getByRole("button", { name: /, Host$/ }).click();
  await page.waitForURL(/\/lab/);
}

test.describe.configure({ mode: "serial" });

test("a host filters and searches the triage table", async ({ page }) => {
  await signInAsHost(page);
  await page.goto(`${demo}/lab/proposals`);
  const table = page.getByRole("table");
  await expect(table.getByRole("link", { name: "Short-path TPU feeding on a bed-slinger" })).toBeVisible();
  // Three seeded proposals wait for a decision; other specs may have submitted more on this stack.
  const waiting = (await (await page.request.get(`${demo}/api/lab/proposals?state=submitted`)).json()).total as number;
  expect(waiting).toBeGreaterThanOrEqual(3);
  await expect(page.getByTestId("triage-total")).toHaveText(`Showing 1–${waiting} of ${waiting}`);

  await page.getByLabel("Search").fill("textur");
  await expect(page.getByTestId("triage-total")).toHaveText("Showing 1–1 of 1");
  await expect(table.getByRole("link", { name: "Spring-steel sheet texture and first-layer grip" })).toBeVisible();
  await expect(page).toHaveURL(/q=textur/);

  await page.getByLabel("Search").fill("");
  await page.getByLabel("Kind").selectOption({ label: "Nozzle" });
  await expect(page.getByTestId("triage-total")).toHaveText("Showing 1–1 of 1");
  await expect(table.getByRole("link", { name: "Coated brass vs steel nozzle wear" })).toBeVisible();

  await page.getByLabel("Kind").selectOption({ label: "All kinds" });
  await page.getByLabel("State").selectOption({ label: "Accepted" });
  await expect(table.getByRole("link", { name: "Twin-inlet ring duct for the Kestrel" })).toBeVisible();
  await page.getByRole("button", { name: /^Age/ }).click();
  await expect(page).toHaveURL(/sort=age/);
  await expect(page.getByRole("columnheader", { name: /Age/ })).toHaveAttribute("aria-sort", /ascending|descending/);
});

test("declining a proposal e-mails its proposer the reason", async ({ page }) => {
  await signInAsHost(page);
  const since = new Date().toISOString();
  await page.goto(`${demo}/lab/proposals`);
  await page.getByRole("link", { name: "Spring-steel sheet texture and first-layer grip" }).click();
  await expect(page.getByRole("heading", { name: "Spring-steel sheet texture and first-layer grip" })).toBeVisible();
  await expect(page.getByText(/In review since/)).toBeVisible();

  await page.getByRole("button", { name: "Decline and e-mail the reason" }).click();
  await expect(page.getByText("Give the proposer a reason of at least 10 characters.")).toBeVisible();
  const reason = "Sheet texture is a finishing choice our print tests cannot measure fairly.";
  await page.getByLabel("Reason for declining").fill(reason);
  await page.getByRole("button", { name: "Decline and e-mail the reason" }).click();
  await expect(page.getByRole("heading", { name: "Decided" })).toBeVisible();
  await expect(page.getByText(reason)).toBeVisible();

  const inbox = inboxUrlFor(demoPort);
  await expect
    .poll(
      async () => {
        const response = await page.request.get(`${inbox}/api/messages?to=${encodeURIComponent(sheetProposer)}&since=${encodeURIComponent(since)}`);
        const messages = (await response.json()) as { subject: string; text?: string }[];
        return messages.find((message) => message.subject.startsWith("About your proposal"))?.text ?? "";
      },
      { timeout: 15_000 },
    )
    .toContain(reason);
});

test("accepting a proposal, planning two pieces × three variants and publishing opens its campaign", async ({ page }) => {
  await signInAsHost(page);
  await page.goto(`${demo}/lab/proposals`);
  await page.getByRole("link", { name: "Short-path TPU feeding on a bed-slinger" }).click();
  await page.getByRole("button", { name: "Accept and plan the test" }).click();
  await page.waitForURL(/\/lab\/proposals\/[^/]+\/plan$/);
  await expect(page.getByRole("heading", { name: "Test plan" })).toBeVisible();

  const picker = page.getByLabel("Add a piece from the library");
  await picker.selectOption({ label: "Overhang ladder (5°/10°/15°) (18 g)" });
  await page.getByRole("button", { name: "Add piece" }).click();
  await picker.selectOption({ label: "Bridge span set (14 g)" });
  await page.getByRole("button", { name: "Add piece" }).click();

  await expect(page.getByLabel("Reference variant")).toHaveValue("Stock part");
  await page.getByLabel("Variant under test 1").fill("Short-path guide, PTFE-lined");
  await page.getByRole("button", { name: "Add a variant under test" }).click();
  await page.getByLabel("Variant under test 2").fill("Short-path guide, printed");
  await page.getByLabel("Repeats of each piece × variant").fill("2");

  // 2 pieces × 3 variants × 2 repeats.
  await expect(page.getByTestId("plan-jobs")).toHaveText("12");
  await expect(page.getByRole("status").filter({ hasText: "Up to date" })).toBeVisible();
  const goal = (await page.getByTestId("plan-goal").textContent())?.trim() ?? "";
  expect(goal).toMatch(/^\$\d/);

  await page.getByLabel("Title", { exact: true }).fill("Short-path TPU guides on the Wren");
  await page.getByRole("button", { name: "Publish the campaign" }).click();
  await page.waitForURL(/\/campaigns\/short-path-tpu-guides-on-the-wren$/);
  await expect(page.getByRole("heading", { name: "Short-path TPU guides on the Wren" })).toBeVisible();
  await expect(page.getByText(`pledged of ${goal} goal`)).toBeVisible();
  await expect(page.getByText("Short-path guide, printed")).toBeVisible();
  await expect(page.getByText("12 jobs")).toBeVisible();
});
