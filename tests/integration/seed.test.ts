import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { DEMO_EMAILS, seedDemo, seedTables } from "@/db/seed";
import { campaignStates, proposalStates } from "@/db/schema";
import { createTempDb } from "../helpers/temp-db";

type TempDb = ReturnType<typeof createTempDb>;

const NOW = new Date("2026-03-10T15:00:00Z");

function tableCounts(temp: TempDb): Record<string, number> {
  const sqlite = temp.db.$client;
  const tables = sqlite
    .prepare(
      "select name from sqlite_master where type = 'table' and name not like 'sqlite_%' and name not like '__drizzle%' order by name",
    )
    .all() as { name: string }[];
  return Object.fromEntries(
    tables.map(({ name }) => [name, (sqlite.prepare(`select count(*) as n from "${name}"`).get() as { n: number }).n]),
  );
}

function all<T>(temp: TempDb, sql: string, ...params: unknown[]): T[] {
  return temp.db.$client.prepare(sql).all(...params) as T[];
}

describe("seedDemo", () => {
  let temp: TempDb;

  beforeEach(() => {
    temp = createTempDb();
  });
  afterEach(() => {
    temp.cleanup();
  });

  it("is idempotent: a second run (even later) leaves the same rows in every table", () => {
    const first = seedDemo(temp.db, { now: NOW });
    const afterFirst = tableCounts(temp);
    const second = seedDemo(temp.db, { now: new Date(NOW.getTime() + 36 * 3600_000) });
    const afterSecond = tableCounts(temp);

    expect(afterSecond).toEqual(afterFirst);
    for (const table of seedTables) {
      expect(first.inserted[table], table).toBe(first.counts[table]);
      expect(afterFirst[table], table).toBe(first.counts[table]);
      expect(second.inserted[table], table).toBe(0);
    }
    expect(afterFirst.outbox).toBe(0);
    expect(afterFirst.upload).toBe(0);
  });

  it("is deterministic: two fresh databases get the same ids", () => {
    seedDemo(temp.db, { now: NOW });
    const other = createTempDb();
    try {
      seedDemo(other.db, { now: NOW });
      for (const table of ["user", "campaign", "pledge", "ledger_entry", "job"]) {
        const q = `select * from "${table}" order by 1`;
        expect(all(other, q), table).toEqual(all(temp, q));
      }
    } finally {
      other.cleanup();
    }
  });

  it("adopts an account that already exists for a demo e-mail and restores its role", () => {
    temp.db.$client
      .prepare("insert into user (id, name, email, role, created_at) values (?, ?, ?, 'supporter', ?)")
      .run("pre-existing-host", "Signed in first", DEMO_EMAILS.host, NOW.getTime());
    seedDemo(temp.db, { now: NOW });
    const hosts = all<{ id: string; role: string }>(temp, "select id, role from user where email = ?", DEMO_EMAILS.host);
    expect(hosts).toEqual([{ id: "pre-existing-host", role: "host" }]);
    const campaignHosts = all<{ host_id: string }>(temp, "select distinct host_id from campaign");
    expect(campaignHosts).toEqual([{ host_id: "pre-existing-host" }]);
    expect(temp.db.$client.pragma("foreign_key_check")).toEqual([]);
  });

  describe("content", () => {
    beforeEach(() => {
      seedDemo(temp.db, { now: NOW });
    });

    it("has one demo account per role, and the member has an active membership", () => {
      const users = all<{ email: string; role: string; emailVerified: number | null }>(
        temp,
        "select email, role, emailVerified from user where email in (?, ?, ?, ?)",
        DEMO_EMAILS.admin,
        DEMO_EMAILS.host,
        DEMO_EMAILS.member,
        DEMO_EMAILS.supporter,
      );
      const roleOf = Object.fromEntries(users.map((u) => [u.email, u.role]));
      expect(roleOf).toEqual({
        [DEMO_EMAILS.admin]: "admin",
        [DEMO_EMAILS.host]: "host",
        [DEMO_EMAILS.member]: "supporter",
        [DEMO_EMAILS.supporter]: "supporter",
      });
      const activeFor = (email: string) =>
        all<{ plan_code: string; current_period_end: number }>(
          temp,
          "select m.plan_code, m.current_period_end from membership m join user u on u.id = m.user_id where u.email = ? and m.status = 'active'",
          email,
        );
      const memberships = activeFor(DEMO_EMAILS.member);
      expect(memberships).toHaveLength(1);
      expect(memberships[0]?.plan_code).toBe("reel");
      expect(memberships[0]?.current_period_end).toBeGreaterThan(NOW.getTime());
      expect(activeFor(DEMO_EMAILS.supporter)).toHaveLength(0);
      expect(all(temp, "select id from user where emailVerified is null")).toHaveLength(0);
    });

    it("has at least 30 supporters and members on every plan, plus a past-due and a canceled membership", () => {
      const [{ n } = { n: 0 }] = all<{ n: number }>(temp, "select count(*) as n from user where role = 'supporter'");
      expect(n).toBeGreaterThanOrEqual(30);
      const plans = all<{ plan_code: string }>(temp, "select distinct plan_code from membership where status = 'active'");
      expect(plans.map((p) => p.plan_code).sort()).toEqual(["reel", "spool", "workshop"]);
      const statuses = all<{ status: string }>(temp, "select distinct status from membership");
      expect(statuses.map((s) => s.status).sort()).toEqual(["active", "canceled", "past_due"]);
      expect(all(temp, "select code from membership_plan order by position")).toHaveLength(3);
    });

    it("covers every proposal state and at least five campaign states", () => {
      const proposals = all<{ state: string }>(temp, "select distinct state from proposal");
      expect(proposals.map((p) => p.state).sort()).toEqual([...proposalStates].sort());
      const campaigns = all<{ state: string }>(temp, "select distinct state from campaign");
      expect(campaigns.length).toBeGreaterThanOrEqual(5);
      for (const { state } of campaigns) expect(campaignStates).toContain(state);
      expect(all(temp, "select id from proposal where state = 'declined' and decline_reason is null")).toHaveLength(0);
      expect(
        all(
          temp,
          "select p.id from proposal p left join proposal m on m.id = p.merged_into_id where p.state = 'merged' and m.id is null",
        ),
      ).toHaveLength(0);
    });

    it("funds funded campaigns by paid pledges alone, keeps open ones below goal, refunds lapsed ones", () => {
      const rows = all<{ state: string; goal: number; paid: number; refunded: number; funded_at: number | null }>(
        temp,
        `select c.state, c.goal_minor as goal, c.funded_at,
           coalesce((select sum(amount_minor) from pledge p where p.campaign_id = c.id and p.state = 'paid'), 0) as paid,
           coalesce((select sum(amount_minor) from pledge p where p.campaign_id = c.id and p.state = 'refunded'), 0) as refunded
         from campaign c`,
      );
      for (const row of rows) {
        if (["funded", "queued", "printing", "reported"].includes(row.state)) {
          expect(row.paid).toBeGreaterThanOrEqual(row.goal);
          expect(row.funded_at).not.toBeNull();
        } else if (row.state === "open") {
          expect(row.paid).toBeLessThan(row.goal);
          expect(row.paid).toBeGreaterThan(0);
        } else if (row.state === "lapsed") {
          expect(row.paid).toBe(0);
          expect(row.refunded).toBeGreaterThan(0);
        }
      }
      expect(rows.filter((r) => r.state === "open")).toHaveLength(2);
    });

    it("records every pledge payment and refund in the ledger, per campaign", () => {
      const rows = all<{ id: string; ledger: number; paid: number; paid_or_refunded: number; refunded: number; payments: number; refunds: number }>(
        temp,
        `select c.id,
           coalesce((select sum(amount_minor) from ledger_entry l where l.campaign_id = c.id and l.kind in ('pledge_payment', 'pledge_refund')), 0) as ledger,
           coalesce((select sum(amount_minor) from ledger_entry l where l.campaign_id = c.id and l.kind = 'pledge_payment'), 0) as payments,
           coalesce((select sum(amount_minor) from ledger_entry l where l.campaign_id = c.id and l.kind = 'pledge_refund'), 0) as refunds,
           coalesce((select sum(amount_minor) from pledge p where p.campaign_id = c.id and p.state = 'paid'), 0) as paid,
           coalesce((select sum(amount_minor) from pledge p where p.campaign_id = c.id and p.state in ('paid', 'refunded')), 0) as paid_or_refunded,
           coalesce((select sum(amount_minor) from pledge p where p.campaign_id = c.id and p.state = 'refunded'), 0) as refunded
         from campaign c`,
      );
      expect(rows.length).toBeGreaterThan(0);
      for (const row of rows) {
        expect(row.payments, row.id).toBe(row.paid_or_refunded);
        expect(row.refunds + row.refunded, row.id).toBe(0);
        expect(row.ledger, row.id).toBe(row.paid_or_refunded - row.refunded);
      }
      // Pending and failed pledges moved no money.
      expect(
        all(temp, "select l.id from ledger_entry l join pledge p on p.id = l.pledge_id where p.state in ('pending', 'failed')"),
      ).toHaveLength(0);
      // The lab fund (memberships minus allocations) never goes negative.
      const [{ fund } = { fund: -1 }] = all<{ fund: number }>(
        temp,
        "select sum(amount_minor) as fund from ledger_entry where kind in ('membership_payment', 'fund_allocation', 'fund_release')",
      );
      expect(fund).toBeGreaterThan(0);
      expect(all(temp, "select id from ledger_entry where currency <> 'USD'")).toHaveLength(0);
    });

    it("gives every campaign a test plan with one reference variant, and jobs only to funded/queued/printing/reported ones", () => {
      const plans = all<{ state: string; pieces: number; variants: number; refs: number; jobs: number; expected: number }>(
        temp,
        `select c.state,
           (select count(*) from test_plan_piece x where x.test_plan_id = t.id) as pieces,
           (select count(*) from test_plan_variant v where v.test_plan_id = t.id) as variants,
           (select count(*) from test_plan_variant v where v.test_plan_id = t.id and v.is_reference = 1) as refs,
           (select count(*) from job j where j.campaign_id = c.id) as jobs,
           (select count(*) from test_plan_piece x where x.test_plan_id = t.id)
             * (select count(*) from test_plan_variant v where v.test_plan_id = t.id) * t.repeats as expected
         from campaign c join test_plan t on t.campaign_id = c.id`,
      );
      expect(plans).toHaveLength(all(temp, "select id from campaign").length);
      for (const plan of plans) {
        expect(plan.pieces).toBeGreaterThan(0);
        expect(plan.variants).toBeGreaterThanOrEqual(2);
        expect(plan.refs).toBe(1);
        expect(plan.jobs).toBe(["funded", "queued", "printing", "reported"].includes(plan.state) ? plan.expected : 0);
      }
      const jobStates = all<{ state: string }>(temp, "select distinct state from job").map((j) => j.state).sort();
      expect(jobStates).toEqual(["done", "running", "scheduled"]);
      expect(all(temp, "select id from report where state = 'published' and published_at is not null")).toHaveLength(1);
    });

    it("keeps every foreign key valid", () => {
      expect(temp.db.$client.pragma("foreign_key_check")).toEqual([]);
      expect(temp.db.$client.pragma("integrity_check", { simple: true })).toBe("ok");
    });
  });
});
