import { describe, expect, it } from "vitest";
import { candidatePairs, chooseNextPair, pairKeyOf, type PairPhoto } from "@/lib/judging/pairs";
import { rankVariants } from "@/lib/judging/ranking";
import { judgingAccess, MIN_COMPARISONS_PER_VARIANT, MIN_RANKING_VOTES, rankingReadiness } from "@/lib/judging/rules";
import { MIN_JUDGING_MS, PAIR_TICKET_LIFETIME_MS, issuePairTicket, openImageToken, readPairTicket, sealImageToken } from "@/lib/judging/tickets";
import { mulberry32 } from "@/lib/seeded-random";

const photo = (id: string, pieceId: string, variantId: string, lightSetKey: string | null = null): PairPhoto => ({ id, pieceId, variantId, lightSetKey });

describe("candidatePairs", () => {
  it("pairs photos of the same piece across variants only, in canonical order", () => {
    const pairs = candidatePairs([photo("p2", "bridge", "stock"), photo("p1", "bridge", "wide"), photo("p3", "bridge", "stock"), photo("p9", "tower", "wide")]);
    expect(pairs.map((p) => p.pairKey).sort()).toEqual(["p1:p2", "p1:p3"]);
    expect(pairKeyOf("b", "a")).toEqual({ pairKey: "a:b", photoAId: "a", photoBId: "b" });
  });

  it("keeps to the same light set when one exists, and falls back to any pair otherwise", () => {
    const pairs = candidatePairs([
      photo("a1", "bridge", "stock", "box"),
      photo("a2", "bridge", "wide", "box"),
      photo("a3", "bridge", "wide", "window"),
      photo("b1", "tower", "stock", "box"),
      photo("b2", "tower", "wide", "window"),
    ]);
    expect(pairs.map((p) => p.pairKey).sort()).toEqual(["a1:a2", "b1:b2"]);
  });
});

describe("chooseNextPair", () => {
  const pairs = candidatePairs([photo("a", "x", "v1"), photo("b", "x", "v2"), photo("c", "x", "v3")]);

  it("skips judged pairs and prefers the least-voted", () => {
    const votes = new Map([
      ["a:b", 4],
      ["a:c", 1],
      ["b:c", 1],
    ]);
    const rng = mulberry32(1);
    for (let i = 0; i < 20; i++) {
      const next = chooseNextPair(pairs, new Set(["a:c"]), votes, rng);
      expect(next?.pair.pairKey).toBe("b:c");
    }
    expect(chooseNextPair(pairs, new Set(["a:b", "a:c", "b:c"]), votes, rng)).toBeUndefined();
  });

  it("puts each photo on either side about half the time", () => {
    const rng = mulberry32(2);
    let aLeft = 0;
    for (let i = 0; i < 2000; i++) if (chooseNextPair([pairs[0]!], new Set(), new Map(), rng)?.leftPhotoId === "a") aLeft++;
    // Binomial(2000, ½): mean 1000, sd ≈ 22; 5 sd either side.
    expect(Math.abs(aLeft - 1000)).toBeLessThan(112);
  });
});

describe("judgingAccess", () => {
  const base = { campaignState: "reported", reportState: "published" as const, pairCount: 6, isBacker: false, hasEarlyAccess: false };
  it("follows the stated rule", () => {
    expect(judgingAccess({ ...base, isBacker: true })).toEqual({ allowed: true, as: "backer" });
    expect(judgingAccess({ ...base, hasEarlyAccess: true })).toEqual({ allowed: true, as: "early" });
    expect(judgingAccess(base)).toMatchObject({ allowed: false, status: 403, code: "backers_only" });
    const draft = { ...base, campaignState: "printing", reportState: "draft" as const };
    expect(judgingAccess({ ...draft, isBacker: true })).toMatchObject({ allowed: false, status: 403, code: "early_access_only" });
    expect(judgingAccess({ ...draft, hasEarlyAccess: true })).toEqual({ allowed: true, as: "early" });
    expect(judgingAccess({ ...base, isBacker: true, pairCount: 0 })).toMatchObject({ allowed: false, status: 409, code: "no_pairs" });
  });
});

describe("rankingReadiness", () => {
  it("needs the stated number of votes and comparisons per variant", () => {
    expect(MIN_RANKING_VOTES).toBe(30);
    expect(MIN_COMPARISONS_PER_VARIANT).toBe(5);
    expect(rankingReadiness(30, [20, 20, 20])).toEqual({ ready: true, votesNeeded: 0 });
    expect(rankingReadiness(12, [8, 8, 8])).toEqual({ ready: false, votesNeeded: 18 });
    // 40 votes, but one variant in only 1 comparison: 4 missing comparisons → at least 2 votes.
    expect(rankingReadiness(40, [40, 39, 1])).toEqual({ ready: false, votesNeeded: 2 });
  });
});

describe("rankVariants", () => {
  const variants = [
    { id: "stock", name: "Stock duct", isReference: true },
    { id: "wide", name: "Wide duct", isReference: false },
  ];
  it("says how many votes are missing, then ranks with intervals around the point", () => {
    const few = { itemCount: 2, first: Int32Array.of(0, 0), second: Int32Array.of(1, 1), outcome: Int8Array.of(-1, 0) };
    expect(rankVariants(variants, few, 1)).toEqual({ ready: false, totalVotes: 2, votesNeeded: 28 });
    // 40 votes: the wide duct preferred 30 times, stock 6, 4 "can't tell".
    const outcome = Int8Array.from([...Array(30).fill(-1), ...Array(6).fill(1), ...Array(4).fill(0)]);
    const many = { itemCount: 2, first: new Int32Array(40), second: new Int32Array(40).fill(1), outcome };
    const ranking = rankVariants(variants, many, 1);
    if (!ranking.ready) throw new Error("expected a ranking");
    expect(ranking.variants.map((v) => v.id)).toEqual(["wide", "stock"]);
    // Two variants: γ_wide/γ_stock = (32 + ½)/(8 + ½) with one virtual tie; geometric mean 1 → γ_wide = √(65/17).
    expect(ranking.variants[0]!.strength).toBeCloseTo(Math.sqrt(32.5 / 8.5), 9);
    for (const v of ranking.variants) {
      expect(v.lowPercent).toBeLessThan(v.chancePercent);
      expect(v.highPercent).toBeGreaterThan(v.chancePercent);
    }
  });
});

describe("pair tickets and image tokens", () => {
  const secret = "unit-test-secret-0123456789abcdef";
  const claim = { userId: "u1", campaignId: "c1", photoAId: "a", photoBId: "b", leftPhotoId: "b", shownAt: 1_000_000 };

  it("accepts a genuine ticket in its window and names each refusal", () => {
    const ticket = issuePairTicket(claim, secret, "nonce-1");
    const at = (now: number, userId = "u1", campaignId = "c1") => readPairTicket(ticket, secret, { userId, campaignId, now });
    expect(at(claim.shownAt + MIN_JUDGING_MS)).toEqual({ ok: true, ticket: { ...claim, nonce: "nonce-1" } });
    expect(at(claim.shownAt + MIN_JUDGING_MS - 1)).toEqual({ ok: false, problem: "too_fast" });
    expect(at(claim.shownAt + PAIR_TICKET_LIFETIME_MS + 1)).toEqual({ ok: false, problem: "expired" });
    expect(at(claim.shownAt + 5000, "u2")).toEqual({ ok: false, problem: "not_yours" });
    expect(at(claim.shownAt + 5000, "u1", "c2")).toEqual({ ok: false, problem: "other_campaign" });
    expect(readPairTicket(ticket, "a-different-secret-0123456789", { userId: "u1", campaignId: "c1", now: claim.shownAt + 5000 })).toEqual({ ok: false, problem: "forged" });
    expect(readPairTicket(`${ticket}x`, secret, { userId: "u1", campaignId: "c1", now: claim.shownAt + 5000 })).toEqual({ ok: false, problem: "forged" });
  });

  it("seals image tokens so they reveal nothing and refuse tampering", () => {
    const token = sealImageToken({ photoId: "photo-123", userId: "u1", expiresAt: 42 }, secret);
    expect(Buffer.from(token, "base64url").toString("latin1")).not.toContain("photo-123");
    expect(openImageToken(token, secret)).toEqual({ photoId: "photo-123", userId: "u1", expiresAt: 42 });
    const bytes = Buffer.from(token, "base64url");
    bytes[14] = (bytes[14] ?? 0) ^ 1;
    expect(openImageToken(bytes.toString("base64url"), secret)).toBeNull();
    expect(openImageToken(token, "a-different-secret-0123456789")).toBeNull();
    expect(sealImageToken({ photoId: "photo-123", userId: "u1", expiresAt: 42 }, secret)).not.toBe(token);
  });
});
