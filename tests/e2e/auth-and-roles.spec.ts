import { expect, test } from "@playwright/test";
import { demoPort, plainPort } from "./support/ports";
import { SignInPage } from "./support/sign-in-page";

const accounts = {
  supporter: "supporter@harbor-street.example",
  member: "member@harbor-street.example",
  host: "host@harbor-street.example",
};

test("a visitor sees the board of seeded campaigns and a campaign's plan and pledges", async ({ page }) => {
  await page.goto("/");
  await expect(page.getByRole("heading", { name: "Open for pledges" })).toBeVisible();
  const cards = page.getByRole("progressbar");
  expect(await cards.count()).toBeGreaterThanOrEqual(5);
  await expect(page.getByText(/^\$[1-9][\d,]*$/).first()).toBeVisible();
  await page.getByRole("main").getByRole("link").first().click();
  await expect(page.getByRole("heading", { name: "Test plan" })).toBeVisible();
  await expect(page.getByRole("heading", { name: "Pledges so far" })).toBeVisible();
  await expect(page.getByText(/^Goal-or-refund: if the goal/)).toBeVisible();
});

test("a supporter signs in through the fake inbox's magic link and is refused the lab", async ({ page, request }) => {
  await new SignInPage(page, plainPort).signIn(accounts.supporter, "/account");
  await expect(page.getByTestId("account-role")).toHaveText("Supporter");

  await page.goto("/lab/proposals");
  await expect(page).toHaveURL(/\/forbidden/);
  await expect(page.getByRole("heading", { name: /not for your account/ })).toBeVisible();

  const apiAsSupporter = await page.request.get("/api/lab/proposals");
  expect(apiAsSupporter.status()).toBe(403);
  expect((await apiAsSupporter.json()).error.code).toBe("forbidden");

  const apiAsVisitor = await request.get("/api/lab/proposals", { headers: { cookie: "" } });
  expect(apiAsVisitor.status()).toBe(401);
});

test("a member is a Filament Club member but still not a host", async ({ page }) => {
  await new SignInPage(page, plainPort).signIn(accounts.member, "/account");
  await expect(page.getByTestId("account-role")).toHaveText("Filament Club member");
  await page.goto("/lab");
  await expect(page).toHaveURL(/\/forbidden/);
});

test("a host signs in by magic link and reaches the lab's proposal table", async ({ page }) => {
  await new SignInPage(page, plainPort).signIn(accounts.host, "/lab");
  await expect(page).toHaveURL(/\/lab\/proposals/);
  await expect(page.getByRole("heading", { name: "Proposals" })).toBeVisible();
  // The seed has three proposals waiting for a decision, plus the header row.
  await expect(page.getByRole("table").getByRole("row")).toHaveCount(4);
  const api = await page.request.get("/api/lab/proposals?state=submitted");
  expect(api.status()).toBe(200);
  const body = await api.json();
  expect(body.rows.length).toBe(3);
  expect(body.rows.every((p: { state: string }) => p.state === "submitted")).toBe(true);
});

test("a visitor sent to the lab is asked to sign in first", async ({ page }) => {
  await page.goto("/lab/proposals");
  await expect(page).toHaveURL(/\/sign-in\?callbackUrl=%2Flab%2Fproposals/);
});

test("opening the link spends nothing; a used link gets a clear page", async ({ page, browser }) => {
  const signIn = new SignInPage(page, plainPort);
  const link = await signIn.requestLink(accounts.supporter);
  // A scanner fetching the link first must not burn it.
  const scanner = await page.request.get(link);
  expect(scanner.status()).toBe(200);
  await page.goto(link);
  await page.getByRole("button", { name: "Sign in to Proofbay" }).click();
  await page.waitForURL((url) => url.pathname === "/");

  const other = await browser.newContext();
  const reuse = await other.newPage();
  await reuse.goto(link);
  await expect(reuse.getByRole("heading", { name: /expired or was already used/ })).toBeVisible();
  await other.close();
});

test("the production sign-in page has no demo shortcut", async ({ page }) => {
  await page.goto("/sign-in");
  await expect(page.getByRole("heading", { name: "Sign in" })).toBeVisible();
  await expect(page.getByRole("heading", { name: "Demo accounts" })).toHaveCount(0);
});

test("in demo mode one click signs in as the host", async ({ page }) => {
  await page.goto(`http://localhost:${demoPort}/sign-in`);
  await expect(page.getByRole("heading", { name: "Demo accounts" })).toBeVisible();
  await page.getByRole("button", { name: /Sign in as .*, Host$/ }).click();
  await expect(page).toHaveURL(new RegExp(`localhost:${demoPort}/lab/proposals`));
});

test("unknown pages and API routes get our 404s; health reports the database and SMTP", async ({ page, request }) => {
  const response = await page.goto("/no-such-page");
  expect(response?.status()).toBe(404);
  await expect(page.getByRole("heading", { name: "Nothing printed here" })).toBeVisible();

  const api = await request.get("/api/no-such-endpoint");
  expect(api.status()).toBe(404);
  expect((await api.json()).error.code).toBe("not_found");

  const health = await request.get("/api/health");
  expect(health.status()).toBe(200);
  const body = await health.json();
  expect(body).toMatchObject({ ok: true, database: { ok: true, journalMode: "wal" }, smtp: { ok: true } });
});
