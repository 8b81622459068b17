import { expect, test, type Page } from "@playwright/test";
import { demoPort } from "./support/ports";
import { SignInPage } from "./support/sign-in-page";

/*
 * Proposals on the demo stack (one-click sign-in for the seeded accounts). The tests run in order:
 * the supporter's proposal from the first is the one the member votes on and the second supporter
 * tries to edit.
 */
test.describe.configure({ mode: "serial" });
test.use({ baseURL: `http://localhost:${demoPort}` });

const title = `Hardened nozzle wear in ABS, run ${Date.now().toString(36)}`;
let slug = "";

async function signInAsDemo(page: Page, accessibleName: string) {
  await page.goto("/sign-in");
  await page.getByRole("button", { name: accessibleName }).click();
  await page.waitForURL((url) => !url.pathname.startsWith("/sign-in"));
}

test("a visitor is sent to sign in before proposing", async ({ page }) => {
  await page.goto("/proposals/new");
  await expect(page).toHaveURL(/\/sign-in\?callbackUrl=%2Fproposals%2Fnew/);
});

test("a supporter saves a draft, finds it in My proposals, edits and submits it", async ({ page }) => {
  await signInAsDemo(page, "Sign in as Jules Adeyemi-Hart, Supporter");
  await page.goto("/proposals/new");
  await page.getByLabel("Title").fill(title);
  await page.getByLabel("Kind of test").selectOption("material");
  await page.getByLabel("Target printer type").selectOption("corexy");
  // ABS is a styrenic printed above the PTFE limit: both cautions appear as soon as it is picked.
  await page.getByLabel("Material").selectOption("ABS");
  const form = page.getByRole("main");
  await expect(form.getByText("Fumes and ultrafine particles", { exact: true })).toBeVisible();
  await expect(form.getByText("High hotend temperature", { exact: true })).toBeVisible();

  // Submitting needs a reason; the error shows beside the field and nothing typed is lost.
  await page.getByRole("button", { name: "Submit to the lab" }).click();
  await expect(page.getByText("Say in a sentence or two (20+ characters) why this test matters.")).toBeVisible();
  await expect(page.getByLabel("Title")).toHaveValue(title);

  await page.getByRole("button", { name: "Save draft" }).click();
  await page.waitForURL(/\/proposals\/[^/]+\/edit\?saved=draft$/);
  await expect(page.getByRole("status").first()).toContainText("Draft saved");
  slug = new URL(page.url()).pathname.split("/")[2] ?? "";
  expect(slug).toMatch(/^hardened-nozzle-wear-in-abs/);

  await page.goto("/account/proposals");
  const card = page.getByTestId("own-proposal").filter({ hasText: title });
  await expect(card).toBeVisible();
  await expect(card).toContainText(/draft/i);
  await card.getByRole("link", { name: `Edit ${title}` }).click();

  await expect(page).toHaveURL(new RegExp(`/proposals/${slug}/edit$`));
  await page.getByLabel("Why it matters").fill("Abrasive-free ABS should barely wear a hardened nozzle; worth measuring before recommending brass.");
  await page.getByLabel("Description").fill("## Plan\n\n- 1 kg of ABS through each nozzle\n- measure the bore before and after");
  await expect(page.getByRole("region", { name: "Preview" }).getByRole("heading", { name: "Plan" })).toBeVisible();
  await page.getByRole("button", { name: "Submit to the lab" }).click();

  await page.waitForURL(new RegExp(`/proposals/${slug}$`));
  await expect(page.getByRole("heading", { level: 1, name: title })).toBeVisible();
  await expect(page.getByText("submitted", { exact: true }).first()).toBeVisible();
  await expect(page.getByRole("heading", { name: "Safety in this test" })).toBeVisible();

  await page.goto("/proposals");
  const openForVotes = page.getByRole("region", { name: /Open for votes/ });
  await expect(openForVotes.getByRole("link", { name: title })).toBeVisible();
});

test("a member votes: the count goes up and the votes left go down", async ({ page }) => {
  expect(slug, "the supporter's test ran first").not.toBe("");
  await signInAsDemo(page, "Sign in as Mina Sato-Ferris, Filament Club member");
  await page.goto(`/proposals/${slug}`);
  const count = page.getByTestId("vote-count");
  const left = page.getByTestId("votes-left");
  await expect(count).toHaveText("0 votes");
  const leftBefore = Number((await left.textContent())?.match(/^(\d+)/)?.[1]);
  expect(leftBefore).toBeGreaterThan(0);

  await page.getByRole("button", { name: `Vote for ${title}` }).click();
  await expect(count).toHaveText("1 vote");
  await expect(page.getByText("Voted", { exact: true })).toBeVisible();
  await expect(left).toContainText(new RegExp(`^${leftBefore - 1} votes? left this month`));

  // The server kept it.
  await page.reload();
  await expect(page.getByTestId("vote-count")).toHaveText("1 vote");
  await expect(page.getByRole("button", { name: `Withdraw your vote for ${title}` })).toBeVisible();
  await expect(page.getByTestId("votes-left")).toContainText(new RegExp(`^${leftBefore - 1} `));
});

test("another supporter cannot open the proposer's edit page", async ({ page }) => {
  expect(slug, "the supporter's test ran first").not.toBe("");
  // A seeded backer without a membership (db/seed-data.ts b02), signed in through the fake inbox.
  await new SignInPage(page, demoPort).signIn("tomasz.lindqvist@backers.example", `/proposals/${slug}/edit`);
  await expect(page).toHaveURL(new RegExp(`/proposals/${slug}/edit$`));
  await expect(page.getByRole("heading", { name: "You cannot edit this proposal" })).toBeVisible();
  await expect(page.getByTestId("not-editable")).toHaveText("Only the person who proposed it can edit this proposal.");
  await expect(page.getByRole("button", { name: "Submit to the lab" })).toHaveCount(0);

  // Someone else's draft is not even there for them.
  const draft = await page.goto("/proposals/silk-pla-layer-adhesion-at-speed/edit");
  expect(draft?.status()).toBe(404);
  const draftPage = await page.goto("/proposals/silk-pla-layer-adhesion-at-speed");
  expect(draftPage?.status()).toBe(404);
});
