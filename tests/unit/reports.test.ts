import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { ReportMarkdown } from "@/components/reports/report-markdown";
import { renderEmail } from "@/emails/render";
import { templateElement } from "@/emails/registry";
import { runCostFromLog } from "@/lib/reports/actual-cost";
import { CRITERION_IDS, formatScore } from "@/lib/reports/criteria";
import { normalisePositions, pairPhotos, type SlotPhoto } from "@/lib/reports/photos";
import { buildScorecard, scorecardChartData, type ScoreRow } from "@/lib/reports/scorecard";
import { assertCanPostLabNote, assertReportEditable } from "@/lib/reports/rules";
import { RuleViolation } from "@/lib/rule-violation";
import { reportDraftSchema } from "@/lib/validation/report";

describe("the write-up's markdown", () => {
  const render = (markdown: string) => renderToStaticMarkup(createElement(ReportMarkdown, { markdown }));

  it("shows an injected script as text, inline and as an HTML block", () => {
    // CommonMark 0.31 §4.6 (HTML blocks, start condition 1: `<script`) and §6.6 (raw inline HTML):
    // both are raw HTML, which this renderer must never pass through as markup.
    const html = render("Before <script>alert(1)</script> after\n\n<script>alert(2)</script>\n\n<img src=x onerror=alert(3)>");
    expect(html).not.toMatch(/<script/i);
    expect(html).not.toMatch(/<img/i);
    expect(html).toContain("&lt;script&gt;alert(1)&lt;/script&gt;");
    expect(html).toContain("&lt;script&gt;alert(2)&lt;/script&gt;");
    expect(html).toContain("onerror=alert(3)");
  });

  it("renders GitHub tables and drops javascript: links", () => {
    // GFM spec 0.29 §4.10 (tables): a header row, a delimiter row and body rows.
    const html = render("| piece | score |\n|---|---|\n| bridge | +2 |\n\n[click](javascript:alert(1))");
    expect(html).toContain("<table>");
    expect(html).toContain("<td>+2</td>");
    expect(html).not.toContain("javascript:");
  });
});

describe("the video link", () => {
  it("accepts https, a blank field (no video) and refuses everything else", () => {
    const parse = (videoUrl: string) => reportDraftSchema.safeParse({ videoUrl });
    expect(parse("https://video.harbor-street.example/r/1").data?.videoUrl).toBe("https://video.harbor-street.example/r/1");
    expect(parse("  ").data?.videoUrl).toBeNull();
    for (const bad of ["http://video.harbor-street.example/r/1", "javascript:alert(1)", "ftp://files.example/r.mp4", "https://"]) {
      const result = parse(bad);
      expect(result.success).toBe(false);
      expect(result.error?.issues[0]?.path).toEqual(["videoUrl"]);
    }
  });
});

describe("the cost from the run log", () => {
  it("matches a worked example", () => {
    // Worked by hand: filament (18.4 + 14.2) g × 2400 ¢/kg = 78.24 ¢ → 79 ¢ (rounded up);
    // machine 1.25 h × 250 ¢/h + 0.95 h × 400 ¢/h = 312.5 + 380 = 692.5 ¢ → 693 ¢;
    // labour 3 h × 3000 ¢/h = 9000 ¢; total 79 + 693 + 9000 = 9772 ¢. The unlogged job is left out.
    const cost = runCostFromLog(
      [
        { filamentUsedGrams: 18.4, actualHours: 1.25, machineRatePerHourMinor: 250 },
        { filamentUsedGrams: 14.2, actualHours: 0.95, machineRatePerHourMinor: 400 },
        { filamentUsedGrams: null, actualHours: null, machineRatePerHourMinor: 250 },
      ],
      { filamentPricePerKgMinor: 2400, labourHours: 3, labourRatePerHourMinor: 3000 },
    );
    expect(cost).toMatchObject({ filamentMinor: 79, machineMinor: 693, labourMinor: 9000, totalMinor: 9772, loggedJobs: 2, jobs: 3 });
    expect(cost?.filamentGrams).toBeCloseTo(32.6, 10);
  });

  it("does not round an exact amount up because of floating point", () => {
    // 0.1 h × 3 = 0.30000000000000004 h in binary floating point (IEEE 754); × 500 ¢/h is exactly 150 ¢.
    const cost = runCostFromLog(
      [0.1, 0.1, 0.1].map((hours) => ({ filamentUsedGrams: 0, actualHours: hours, machineRatePerHourMinor: 500 })),
      { filamentPricePerKgMinor: 2000, labourHours: 0, labourRatePerHourMinor: 0 },
    );
    expect(cost?.machineMinor).toBe(150);
  });

  it("is undefined before any job is logged", () => {
    expect(runCostFromLog([{ filamentUsedGrams: null, actualHours: 2, machineRatePerHourMinor: 1 }], { filamentPricePerKgMinor: 1, labourHours: 1, labourRatePerHourMinor: 1 })).toBeUndefined();
  });
});

describe("photo pairs", () => {
  const photo = (id: string, variantId: string, position: number, lightSetKey: string | null): SlotPhoto => ({
    id,
    pieceId: "p1",
    variantId,
    uploadId: `u-${id}`,
    caption: "",
    position,
    lightSetKey,
  });

  it("puts same-light shots side by side first, then the rest by position", () => {
    const photos = [
      photo("a", "ref", 0, "box-1"),
      photo("b", "ref", 1, null),
      photo("c", "ref", 2, "box-2"),
      photo("x", "alt", 0, "box-2"),
      photo("y", "alt", 1, null),
      photo("z", "alt", 2, "box-1"),
      { ...photo("other", "alt", 0, "box-1"), pieceId: "p2" },
    ];
    const pairs = pairPhotos(photos, "p1", "ref", "alt").map((pair) => [pair.left?.id ?? null, pair.right?.id ?? null, pair.lightSetKey]);
    expect(pairs).toEqual([
      ["a", "z", "box-1"],
      ["c", "x", "box-2"],
      ["b", "y", null],
    ]);
  });

  it("leaves a gap when one variant has more photos", () => {
    const pairs = pairPhotos([photo("a", "ref", 0, null), photo("b", "ref", 1, null), photo("x", "alt", 0, null)], "p1", "ref", "alt");
    expect(pairs.map((pair) => [pair.left?.id ?? null, pair.right?.id ?? null])).toEqual([
      ["a", "x"],
      ["b", null],
    ]);
  });

  it("numbers positions per slot in the given order", () => {
    const numbered = normalisePositions([
      { pieceId: "p1", variantId: "v1", uploadId: "1", caption: "", lightSetKey: null },
      { pieceId: "p1", variantId: "v2", uploadId: "2", caption: "", lightSetKey: null },
      { pieceId: "p1", variantId: "v1", uploadId: "3", caption: "", lightSetKey: null },
    ]);
    expect(numbered.map((p) => p.position)).toEqual([0, 0, 1]);
  });
});

describe("the scorecard", () => {
  const variants = [
    { id: "ref", name: "Stock duct", isReference: true },
    { id: "a", name: "Wide mouth", isReference: false },
    { id: "b", name: "Splitter", isReference: false },
  ];

  it("uses a run-wide score, else the mean of per-piece scores, and 0 for the reference", () => {
    const scores: ScoreRow[] = [
      { pieceId: null, variantId: "a", criterion: "bridge-sag", score: -1, note: "sags 0.4 mm more" },
      { pieceId: "p1", variantId: "a", criterion: "bridge-sag", score: 2, note: "ignored: the run-wide score wins" },
      { pieceId: "p1", variantId: "b", criterion: "bridge-sag", score: 2, note: "" },
      { pieceId: "p2", variantId: "b", criterion: "bridge-sag", score: 1, note: "" },
    ];
    const lines = buildScorecard(scores, variants);
    expect(lines.map((line) => line.criterion)).toEqual(CRITERION_IDS);
    const sag = lines.find((line) => line.criterion === "bridge-sag")!;
    expect(sag.cells.ref).toEqual({ score: 0, note: "", fromPieces: 0 });
    expect(sag.cells.a).toMatchObject({ score: -1, note: "sags 0.4 mm more" });
    expect(sag.cells.b).toMatchObject({ score: 1.5, fromPieces: 2 });
    expect(lines.find((line) => line.criterion === "noise")!.cells.a).toBeNull();

    const chart = scorecardChartData(lines, variants);
    expect(chart.find((row) => row.criterion === "Bridge sag")).toEqual({ criterion: "Bridge sag", a: -1, b: 1.5 });
    expect(chart.find((row) => row.criterion === "Noise")).toEqual({ criterion: "Noise" });
  });

  it("prints scores with a sign and a true minus", () => {
    expect([formatScore(2), formatScore(0), formatScore(-1.5), formatScore(1 / 3)]).toEqual(["+2", "0", "\u22121.5", "+0.3"]);
  });
});

describe("report and note rules", () => {
  it("allows editing only before publishing, on funded work", () => {
    expect(() => assertReportEditable("printing", "draft")).not.toThrow();
    expect(() => assertReportEditable("funded", null)).not.toThrow();
    for (const [state, report] of [["reported", "published"], ["printing", "published"], ["open", null], ["lapsed", null]] as const) {
      expect(() => assertReportEditable(state, report)).toThrow(RuleViolation);
    }
  });

  it("takes lab notes only between funding and the report", () => {
    for (const state of ["funded", "queued", "printing"] as const) expect(() => assertCanPostLabNote(state)).not.toThrow();
    for (const state of ["open", "lapsed", "withdrawn", "reported"] as const) {
      try {
        assertCanPostLabNote(state);
        expect.unreachable();
      } catch (error) {
        expect(error).toBeInstanceOf(RuleViolation);
        expect((error as RuleViolation).status).toBe(409);
      }
    }
  });
});

describe("the report and note e-mails", () => {
  it("have a plain-text part with the summary and the link", async () => {
    const mail = await renderEmail(
      templateElement("report-published", {
        name: "Ines",
        campaignTitle: "Wide-mouth blower duct",
        summary: "The splitter wins on bridges.",
        reportUrl: "http://localhost:3000/reports/wide-mouth",
      }),
    );
    expect(mail.text).toContain("The splitter wins on bridges.");
    expect(mail.text).toContain("http://localhost:3000/reports/wide-mouth");
    expect(mail.html).toContain("Read the report");
  });

  it("keep a note's markup as text", async () => {
    const mail = await renderEmail(
      templateElement("lab-note", {
        name: null,
        campaignTitle: "PETG bridging",
        bodyMd: "First print failed.\n\n<b>Reprinting</b> tomorrow.",
        authorName: "Eli",
        campaignUrl: "http://localhost:3000/campaigns/petg#lab-notes",
      }),
    );
    expect(mail.html).not.toContain("<b>Reprinting</b>");
    expect(mail.text).toContain("First print failed.");
    expect(mail.text).toContain("Eli posted");
  });
});
