import { afterAll, describe, expect, it } from "vitest";
import { getCampaignBySlug, listBoardCampaigns, listPublicPledges } from "@/db/queries/campaigns";
import { listProposalsForTriage } from "@/db/queries/proposals";
import { seedDemo } from "@/db/seed";
import { createTempDb } from "../helpers/temp-db";

const temp = createTempDb();
seedDemo(temp.db);
afterAll(() => temp.cleanup());

/** Independent recomputation straight from the rows, in plain SQL, to check the query builder's joins. */
function totalsFromRows(campaignId: string) {
  const sqlite = temp.db.$client;
  const paid = sqlite
    .prepare("select coalesce(sum(amount_minor), 0) as total from pledge where campaign_id = ? and state = 'paid'")
    .get(campaignId) as { total: number };
  const backers = sqlite
    .prepare("select count(distinct supporter_id) as n from pledge where campaign_id = ? and state in ('paid', 'refunded')")
    .get(campaignId) as { n: number };
  const fund = sqlite
    .prepare(
      "select coalesce(-sum(amount_minor), 0) as total from ledger_entry where campaign_id = ? and kind in ('fund_allocation', 'fund_release')",
    )
    .get(campaignId) as { total: number };
  return { pledgedMinor: paid.total, backerCount: backers.n, labFundMinor: fund.total };
}

describe("board and campaign queries", () => {
  it("sum each campaign's own paid pledges, backers and lab-fund money", () => {
    const board = listBoardCampaigns(temp.db);
    expect(board.length).toBeGreaterThanOrEqual(5);
    for (const campaign of board) {
      expect({ pledgedMinor: campaign.pledgedMinor, backerCount: campaign.backerCount, labFundMinor: campaign.labFundMinor }).toEqual(
        totalsFromRows(campaign.id),
      );
    }
    expect(board.some((campaign) => campaign.pledgedMinor > 0)).toBe(true);
    expect(board.some((campaign) => campaign.labFundMinor > 0)).toBe(true);
  });

  it("reads one campaign with its plan, pieces, variants and public pledges", () => {
    const [first] = listBoardCampaigns(temp.db).filter((campaign) => campaign.state === "open");
    if (!first) throw new Error("seed has no open campaign");
    const found = getCampaignBySlug(temp.db, first.slug);
    expect(found?.pledgedMinor).toBe(totalsFromRows(first.id).pledgedMinor);
    expect(found?.plan?.campaignId).toBe(first.id);
    expect(found?.pieces.length).toBeGreaterThan(0);
    expect(found?.variants.filter((variant) => variant.isReference)).toHaveLength(1);
    const pledges = listPublicPledges(temp.db, first.id);
    expect(pledges.every((pledge) => pledge.state === "paid" || pledge.state === "refunded")).toBe(true);
    expect(getCampaignBySlug(temp.db, "no-such-campaign")).toBeUndefined();
  });

  it("lists proposals for triage without anyone's drafts, with vote counts", () => {
    const rows = listProposalsForTriage(temp.db);
    expect(rows.some((row) => row.state === "draft")).toBe(false);
    const votes = temp.db.$client.prepare("select count(*) as n from proposal_vote").get() as { n: number };
    expect(rows.reduce((sum, row) => sum + row.votes, 0)).toBeLessThanOrEqual(votes.n);
    expect(rows.some((row) => row.votes > 0)).toBe(true);
    expect(listProposalsForTriage(temp.db, { state: "declined" }).every((row) => row.state === "declined")).toBe(true);
  });
});
