import { eq } from "drizzle-orm";
import type { ReactElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { afterAll, describe, expect, it, vi } from "vitest";
import { seedDemo } from "@/db/seed";
import { users } from "@/db/schema";
import { formatMoney } from "@/lib/format";
import { createTempDb } from "../helpers/temp-db";

/*
 * The Filament Club pages rendered on the server against the seeded lab: the plans with their
 * perks and prices (db/seed-data.ts PLANS: Spool $5 / 3 votes, Reel $12 / 8 votes and early blind
 * pairs, Workshop $30 / 20 votes), the member's own state, and the host's lab-fund page.
 */

const signedIn = vi.hoisted(() => ({ viewer: null as null | { id: string; email: string; name: string | null; role: "supporter" | "host" | "admin" | "member" } }));
vi.mock("@/server/auth", () => ({ getViewer: async () => signedIn.viewer, auth: async () => (signedIn.viewer ? { user: signedIn.viewer } : null) }));
vi.mock("next/navigation", () => ({
  redirect: (url: string) => {
    throw new Error(`redirect to ${url}`);
  },
  notFound: () => {
    throw new Error("notFound");
  },
}));
vi.mock("next/cache", () => ({ revalidatePath: () => {} }));

const temp = createTempDb();
seedDemo(temp.db);
process.env.DATABASE_PATH = temp.file;
afterAll(() => temp.cleanup());

function as(email: string, role: "supporter" | "member" | "host") {
  const row = temp.db.select().from(users).where(eq(users.email, email)).get()!;
  signedIn.viewer = { id: row.id, email: row.email!, name: row.name, role };
}
const text = (html: string) => html.replace(/<[^>]+>/g, " ").replace(/\s+/g, " ");

async function render(page: (props: never) => Promise<ReactElement>, props: Record<string, unknown> = {}): Promise<string> {
  return renderToStaticMarkup(await page(props as never));
}

describe("Filament Club pages", () => {
  it("/club lists each plan with its price and perks, and a join button for a supporter", async () => {
    const { default: ClubPage } = await import("@/app/(public)/club/page");
    signedIn.viewer = null;
    const visitor = text(await render(ClubPage));
    expect(visitor).toMatch(/Spool \$5 a month 3 proposal votes a month/);
    expect(visitor).toMatch(/Reel \$12 a month 8 proposal votes a month Judge blind pairs before they open to everyone/);
    expect(visitor).toMatch(/Workshop \$30 a month 20 proposal votes a month/);
    expect(visitor).toContain("Sign in to join");
    as("supporter@harbor-street.example", "supporter");
    expect(text(await render(ClubPage))).toContain("Join Reel");
    as("member@harbor-street.example", "member");
    const member = text(await render(ClubPage));
    expect(member).toContain("You are a Reel member.");
    expect(member).not.toContain("Join Reel");
  });

  it("/account/membership shows the member's plan, state and the cancel button", async () => {
    const { default: MembershipPage } = await import("@/app/(account)/account/membership/page");
    as("member@harbor-street.example", "member");
    const html = await render(MembershipPage, { searchParams: Promise.resolve({}) });
    expect(html).toContain('data-status="active"');
    expect(text(html)).toMatch(/Plan Reel, \$12 a month State Active Paid until/);
    expect(html).toContain('data-testid="cancel-membership"');
    as("supporter@harbor-street.example", "supporter");
    expect(text(await render(MembershipPage, { searchParams: Promise.resolve({}) }))).toContain("You are not a Filament Club member.");
  });

  it("/lab/fund shows the balance, its parts and the history", async () => {
    const { default: FundPage } = await import("@/app/lab/fund/page");
    as("host@harbor-street.example", "host");
    const html = text(await render(FundPage));
    // Seeded income summed from MEMBERSHIPS × PLANS prices (db/seed-data.ts), less its one $40 allocation.
    const { MEMBERSHIPS, PLANS } = await import("@/db/seed-data");
    const price = Object.fromEntries(PLANS.map((plan) => [plan.code, plan.monthlyMinor]));
    const income = MEMBERSHIPS.reduce((sum, m) => sum + m.periods * price[m.plan]!, 0);
    expect(html).toContain(`Balance ${formatMoney(income - 4_000, "USD")} Membership income ${formatMoney(income, "USD")}`);
    expect(html).toContain("Allocated to campaigns −$40");
    expect(html).toContain("Membership income");
    expect(html).toContain("Allocate from the lab fund");
  });
});
