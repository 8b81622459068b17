import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { seedDemo } from "@/db/seed";
import { campaigns, jobRuns, jobs, labSettings, labStartWindows, printerMaintenance, printers, users } from "@/db/schema";
import { formatLocalDateTime } from "@/lib/lab-calendar/local-time";
import type { Viewer } from "@/server/auth";
import { createTempDb } from "../helpers/temp-db";

const session = vi.hoisted(() => ({ viewer: null as Viewer | null }));
vi.mock("@/server/auth", () => ({
  getViewer: async () => session.viewer,
  auth: async () => (session.viewer ? { user: session.viewer } : null),
}));
vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));

const temp = createTempDb();
seedDemo(temp.db);
process.env.DATABASE_PATH = temp.file;
afterAll(() => temp.cleanup());

type Actions = {
  printers: typeof import("@/app/lab/printers/actions");
  calendar: typeof import("@/app/lab/calendar/actions");
  jobs: typeof import("@/app/lab/jobs/actions");
  calibration: typeof import("@/app/lab/calibration/actions");
};
let actions: Actions;
type Handler = (request: Request, segment: { params: Promise<Record<string, string>> }) => Promise<Response>;
let feed: Handler;
beforeAll(async () => {
  actions = {
    printers: await import("@/app/lab/printers/actions"),
    calendar: await import("@/app/lab/calendar/actions"),
    jobs: await import("@/app/lab/jobs/actions"),
    calibration: await import("@/app/lab/calibration/actions"),
  };
  ({ GET: feed } = (await import("@/app/api/queue/calendar.ics/route")) as unknown as { GET: Handler });
});

const userByEmail = (email: string) => temp.db.select().from(users).where(eq(users.email, email)).get()!;
const asViewer = (email: string): Viewer => {
  const user = userByEmail(email);
  return { id: user.id, email: user.email ?? "", name: user.name, role: user.role };
};
const admin = asViewer("owner@harbor-street.example");
const host = asViewer("host@harbor-street.example");
const supporter = asViewer("supporter@harbor-street.example");
const printerBySlug = (slug: string) => temp.db.select().from(printers).where(eq(printers.slug, slug)).get()!;
const { timeZone } = temp.db.select().from(labSettings).get()!;
const HOUR = 3_600_000;

function failure<T>(result: { ok: true; data: T } | { ok: false; status: number; code: string; message: string; fields?: Record<string, string> }) {
  if (result.ok) throw new Error(`expected a failure, got ${JSON.stringify(result.data)}`);
  return result;
}
function success<T>(result: { ok: true; data: T } | { ok: false; message: string }): T {
  if (!result.ok) throw new Error(`expected success, got ${result.message}`);
  return result.data;
}

const goodPrinter = {
  name: "Bay 4 — Plover",
  model: "Plover 250",
  motionType: "corexy",
  buildXmm: 250,
  buildYmm: 250,
  buildZmm: 260,
  nozzleMm: 0.4,
  maxFlowMm3PerS: 28,
  enclosed: false,
  materials: ["PLA", "PETG"],
  status: "available",
  hourlyRate: 1.5,
  efficiency: 0.55,
};

describe("who may change printers, the calendar, the run log and calibration", () => {
  it("refuses a host on the admin's printer and calendar actions with 403, and a supporter on the run log", async () => {
    session.viewer = host;
    expect(failure(await actions.printers.createPrinterAction(goodPrinter)).status).toBe(403);
    expect(failure(await actions.printers.addMaintenanceAction({})).status).toBe(403);
    expect(failure(await actions.calendar.addStartWindowsAction({ isoWeekdays: [1], start: "08:00", end: "12:00" })).status).toBe(403);
    expect(failure(await actions.calendar.rotateFeedTokenAction()).status).toBe(403);
    expect(failure(await actions.calibration.applyCalibrationAction(printerBySlug("bay-1-kestrel").id)).status).toBe(403);
    session.viewer = supporter;
    expect(failure(await actions.jobs.startRunAction({ jobId: "x" })).status).toBe(403);
    expect(failure(await actions.jobs.finishRunAction({})).status).toBe(403);
    session.viewer = null;
    expect(failure(await actions.jobs.startRunAction({ jobId: "x" })).status).toBe(401);
  });
});

describe("printers", () => {
  it("adds a printer and refuses bad input with 422 naming the field", async () => {
    session.viewer = admin;
    const created = success(await actions.printers.createPrinterAction(goodPrinter));
    const stored = temp.db.select().from(printers).where(eq(printers.id, created.id)).get()!;
    expect(stored).toMatchObject({ slug: "bay-4-plover", hourlyRateMinor: 150, materials: ["PLA", "PETG"] });

    const unknown = failure(await actions.printers.createPrinterAction({ ...goodPrinter, materials: ["PLA", "Unobtainium"] }));
    expect(unknown.status).toBe(422);
    expect(unknown.fields?.materials).toMatch(/Unknown material Unobtainium/);
    // ABS and ASA need an enclosure (lib/estimate/materials): an open printer may not list them.
    const open = failure(await actions.printers.createPrinterAction({ ...goodPrinter, materials: ["ABS"] }));
    expect(open.fields?.materials).toMatch(/enclosed/);
    const tiny = failure(await actions.printers.createPrinterAction({ ...goodPrinter, buildZmm: 10, maxFlowMm3PerS: -1 }));
    expect(Object.keys(tiny.fields ?? {}).sort()).toEqual(["buildZmm", "maxFlowMm3PerS"]);
  });

  it("adds a maintenance block typed in the lab's time zone and refuses an end before the start or an overlap", async () => {
    session.viewer = admin;
    const wren = printerBySlug("bay-2-wren");
    const start = Date.now() + 3 * 24 * HOUR;
    const local = (ms: number) => formatLocalDateTime(ms, timeZone);
    const ok = success(await actions.printers.addMaintenanceAction({ printerId: wren.id, start: local(start), end: local(start + 4 * HOUR), reason: "Belt tension and nozzle swap" }));
    const block = temp.db.select().from(printerMaintenance).where(eq(printerMaintenance.id, ok.id)).get()!;
    // Minutes survive the round trip through the lab's wall clock (seconds are dropped by the form).
    expect(block.startsAt.getTime()).toBe(Math.floor(start / 60_000) * 60_000);

    const backwards = failure(await actions.printers.addMaintenanceAction({ printerId: wren.id, start: local(start), end: local(start - HOUR), reason: "Backwards" }));
    expect(backwards.status).toBe(422);
    expect(backwards.fields?.end).toMatch(/after the start/);
    const overlap = failure(await actions.printers.addMaintenanceAction({ printerId: wren.id, start: local(start + HOUR), end: local(start + 6 * HOUR), reason: "Second block" }));
    expect(overlap.status).toBe(422);
    expect(overlap.fields?.start).toMatch(/overlaps/);
    const noReason = failure(await actions.printers.addMaintenanceAction({ printerId: wren.id, start: "tomorrow", end: local(start), reason: "" }));
    expect(Object.keys(noReason.fields ?? {}).sort()).toEqual(["reason", "start"]);
  });
});

describe("lab calendar", () => {
  it("adds weekly start windows and refuses an end before the start or an overlapping window, naming the day", async () => {
    session.viewer = admin;
    // The seed staffs every day 08:00–20:00; clear Monday and Tuesday first.
    const seeded = temp.db.select().from(labStartWindows).all().filter((window) => window.isoWeekday <= 2);
    expect(seeded).toHaveLength(2);
    for (const window of seeded) success(await actions.calendar.removeStartWindowAction(window.id));
    expect(failure(await actions.calendar.removeStartWindowAction(seeded[0]!.id)).status).toBe(404);
    success(await actions.calendar.addStartWindowsAction({ isoWeekdays: [1, 2], start: "08:00", end: "12:00" }));
    const backwards = failure(await actions.calendar.addStartWindowsAction({ isoWeekdays: [3], start: "18:00", end: "09:00" }));
    expect(backwards.status).toBe(422);
    expect(backwards.fields?.end).toMatch(/after the start/);
    const overlap = failure(await actions.calendar.addStartWindowsAction({ isoWeekdays: [3, 2], start: "11:00", end: "14:00" }));
    expect(overlap.status).toBe(422);
    expect(overlap.fields?.start).toMatch(/^Tuesday already has a window 08:00–12:00/);
    const noDay = failure(await actions.calendar.addStartWindowsAction({ isoWeekdays: [], start: "11:00", end: "14:00" }));
    expect(noDay.fields?.isoWeekdays).toBeDefined();
  });
});

describe("run log", () => {
  function scheduledJob() {
    const job = temp.db
      .select()
      .from(jobs)
      .innerJoin(printers, eq(printers.id, jobs.printerId))
      .where(and(eq(jobs.state, "scheduled"), eq(printers.status, "available")))
      .get();
    if (!job) throw new Error("the seed has no scheduled job on an available printer");
    return job.job;
  }

  it("starts a job once however often Start is pressed, and finishing twice logs one run", async () => {
    session.viewer = host;
    const job = scheduledJob();
    const first = success(await actions.jobs.startRunAction({ jobId: job.id }));
    const again = success(await actions.jobs.startRunAction({ jobId: job.id }));
    expect(again).toEqual({ ...first, started: false });
    expect(temp.db.select().from(jobRuns).where(eq(jobRuns.jobId, job.id)).all()).toHaveLength(1);
    expect(temp.db.select().from(jobs).where(eq(jobs.id, job.id)).get()?.state).toBe("running");

    const finish = { runId: first.runId, actualHours: 2.5, filamentUsedGrams: 19.4, outcome: "done", notes: "Clean overhangs" };
    const done = success(await actions.jobs.finishRunAction(finish));
    const retried = success(await actions.jobs.finishRunAction(finish));
    expect(done.repeated).toBe(false);
    expect(retried.repeated).toBe(true);
    const runs = temp.db.select().from(jobRuns).where(eq(jobRuns.jobId, job.id)).all();
    expect(runs).toHaveLength(1);
    expect(runs[0]).toMatchObject({ outcome: "done", actualHours: 2.5, filamentUsedGrams: 19.4, attempt: 1 });
    expect(temp.db.select().from(jobs).where(eq(jobs.id, job.id)).get()).toMatchObject({ state: "done", actualHours: 2.5 });

    // The same run logged with other figures is a conflict, not a silent overwrite.
    expect(failure(await actions.jobs.finishRunAction({ ...finish, actualHours: 3 })).status).toBe(409);
    // A done job cannot start again.
    expect(failure(await actions.jobs.startRunAction({ jobId: job.id })).status).toBe(409);
  });

  it("refuses to start a job on a printer that is down or inside a maintenance block now (409)", async () => {
    session.viewer = host;
    const job = scheduledJob();
    const block = temp.db
      .insert(printerMaintenance)
      .values({ printerId: job.printerId!, startsAt: new Date(Date.now() - HOUR), endsAt: new Date(Date.now() + HOUR), reason: "Hotend swap" })
      .returning()
      .get();
    const inBlock = failure(await actions.jobs.startRunAction({ jobId: job.id }));
    expect(inBlock).toMatchObject({ status: 409, code: "printer_in_maintenance" });
    temp.db.delete(printerMaintenance).where(eq(printerMaintenance.id, block.id)).run();

    temp.db.update(printers).set({ status: "down" }).where(eq(printers.id, job.printerId!)).run();
    expect(failure(await actions.jobs.startRunAction({ jobId: job.id }))).toMatchObject({ status: 409, code: "printer_unavailable" });
    temp.db.update(printers).set({ status: "available" }).where(eq(printers.id, job.printerId!)).run();
    expect(temp.db.select().from(jobRuns).where(eq(jobRuns.jobId, job.id)).all()).toHaveLength(0);
  });

  it("sends a failed job back into the queue; the next start is attempt 2", async () => {
    session.viewer = host;
    const job = scheduledJob();
    const started = success(await actions.jobs.startRunAction({ jobId: job.id }));
    const noReason = failure(await actions.jobs.finishRunAction({ runId: started.runId, actualHours: 1, filamentUsedGrams: 6, outcome: "failed" }));
    expect(noReason.status).toBe(422);
    expect(noReason.fields?.failureReason).toBeDefined();
    const badHours = failure(await actions.jobs.finishRunAction({ runId: started.runId, actualHours: 0, filamentUsedGrams: -2, outcome: "done" }));
    expect(Object.keys(badHours.fields ?? {}).sort()).toEqual(["actualHours", "filamentUsedGrams"]);

    success(await actions.jobs.finishRunAction({ runId: started.runId, actualHours: 1, filamentUsedGrams: 6, outcome: "failed", failureReason: "Detached from the bed at layer 40" }));
    const after = temp.db.select().from(jobs).where(eq(jobs.id, job.id)).get()!;
    // Back in the queue: the recompute that follows the log places it again, with no actuals from the failed attempt.
    expect(after.state).toBe("scheduled");
    expect(after.scheduledStart).not.toBeNull();
    expect(after.actualHours).toBeNull();
    const failedRun = temp.db.select().from(jobRuns).where(eq(jobRuns.id, started.runId)).get();
    expect(failedRun).toMatchObject({ outcome: "failed", failureReason: "Detached from the bed at layer 40" });

    const retry = success(await actions.jobs.startRunAction({ jobId: job.id }));
    expect(retry).toMatchObject({ attempt: 2, started: true });
  });
});

describe("calibration", () => {
  it("stores the fitted efficiency on the printer, and applying it again changes nothing", async () => {
    const heron = printerBySlug("bay-3-heron");
    temp.db.update(printers).set({ efficiency: 0.6 }).where(eq(printers.id, heron.id)).run();
    const job = temp.db.select().from(jobs).innerJoin(campaigns, eq(campaigns.id, jobs.campaignId)).get()!.job;
    // Worked arithmetic: every run took 1.1 × its estimate, so least squares through the origin
    // gives k = Σea/Σe² = 1.1 exactly and the efficiency becomes 0.6 / 1.1 = 0.5454…
    const pairs = [
      [2, 2.2],
      [4, 4.4],
      [5, 5.5],
    ] as const;
    temp.db.delete(jobRuns).where(eq(jobRuns.jobId, job.id)).run();
    pairs.forEach(([estimated, actual], index) =>
      temp.db
        .insert(jobRuns)
        .values({
          jobId: job.id,
          attempt: 100 + index,
          printerId: heron.id,
          startedAt: new Date(Date.now() - (index + 2) * 24 * HOUR),
          finishedAt: new Date(Date.now() - (index + 1) * 24 * HOUR),
          estimatedHoursAtStart: estimated,
          efficiencyAtStart: 0.6,
          actualHours: actual,
          filamentUsedGrams: 10,
          outcome: "done",
        })
        .run(),
    );
    session.viewer = admin;
    const applied = success(await actions.calibration.applyCalibrationAction(heron.id));
    expect(applied.runs).toBe(3);
    expect(applied.previous).toBe(0.6);
    expect(applied.efficiency).toBeCloseTo(0.6 / 1.1, 4);
    expect(printerBySlug("bay-3-heron").efficiency).toBeCloseTo(0.5455, 4);

    const again = success(await actions.calibration.applyCalibrationAction(heron.id));
    expect(again.efficiency).toBe(applied.efficiency);
  });

  it("refuses to fit from fewer than three runs", async () => {
    session.viewer = admin;
    const kestrel = printerBySlug("bay-1-kestrel");
    temp.db.delete(jobRuns).where(eq(jobRuns.printerId, kestrel.id)).run();
    const result = failure(await actions.calibration.applyCalibrationAction(kestrel.id));
    expect(result.status).toBe(409);
  });
});

describe("the host calendar feed", () => {
  const get = (query: string) => feed(new Request(`http://localhost:3000/api/queue/calendar.ics${query}`), { params: Promise.resolve({}) });

  it("answers 404 until a token exists, and for a missing or wrong token", async () => {
    temp.db.update(labSettings).set({ calendarFeedToken: null }).where(eq(labSettings.id, 1)).run();
    expect((await get("?token=anything")).status).toBe(404);
    session.viewer = admin;
    success(await actions.calendar.rotateFeedTokenAction());
    const token = temp.db.select().from(labSettings).get()!.calendarFeedToken!;
    expect(token).toMatch(/^[A-Za-z0-9_-]{32}$/);
    session.viewer = null;
    expect((await get("")).status).toBe(404);
    const oneCharOff = `${token.slice(0, -1)}${token.endsWith("x") ? "y" : "x"}`;
    expect((await get(`?token=${oneCharOff}`)).status).toBe(404);
    expect((await get(`?token=${token}extra`)).status).toBe(404);
    expect((await get(`?token=${token}`)).status).toBe(200);
  });

  it("serves RFC 5545 text with one event per placed job, and the old URL dies when the token rotates", async () => {
    const token = temp.db.select().from(labSettings).get()!.calendarFeedToken!;
    const response = await get(`?token=${token}`);
    expect(response.headers.get("content-type")).toBe("text/calendar; charset=utf-8");
    const text = await response.text();
    // RFC 5545 §3.1: content lines end in CRLF; §3.4: one VCALENDAR with VERSION and PRODID.
    expect(text.startsWith("BEGIN:VCALENDAR\r\n")).toBe(true);
    expect(text).toMatch(/\r\nVERSION:2\.0\r\n/);
    expect(text).toMatch(/\r\nPRODID:/);
    const placed = temp.db.select().from(jobs).where(and(eq(jobs.state, "scheduled"))).all().filter((job) => job.scheduledStart && job.scheduledEnd && job.printerId);
    expect((text.match(/BEGIN:VEVENT/g) ?? []).length).toBeGreaterThanOrEqual(placed.length);
    const job = placed[0]!;
    const unfolded = text.replace(/\r\n[ \t]/g, "");
    const event = unfolded.split("BEGIN:VEVENT").find((block) => block.includes(`UID:job-${job.id}@proofbay.queue`));
    expect(event).toBeDefined();
    // §3.3.5 form #2, UTC time: YYYYMMDD"T"HHMMSS"Z".
    const utc = (date: Date) => date.toISOString().replace(/[-:]/g, "").replace(/\.\d{3}/, "");
    expect(event).toContain(`DTSTART:${utc(job.scheduledStart!)}`);
    expect(event).toContain(`DTEND:${utc(job.scheduledEnd!)}`);

    session.viewer = admin;
    success(await actions.calendar.rotateFeedTokenAction());
    session.viewer = null;
    expect((await get(`?token=${token}`)).status).toBe(404);
  });
});

describe("page gates", () => {
  // next/navigation's redirect() throws an error whose digest carries the target URL.
  async function redirectOf(render: () => Promise<unknown>): Promise<string | null> {
    try {
      await render();
      return null;
    } catch (error) {
      const digest = (error as { digest?: string }).digest ?? "";
      return digest.split(";")[2] ?? digest;
    }
  }

  it("sends a host away from the admin's printers page and a supporter away from the run log and calibration", async () => {
    const printersPage = (await import("@/app/lab/printers/page")).default;
    const runLogPage = (await import("@/app/lab/jobs/page")).default;
    const calibrationPage = (await import("@/app/lab/calibration/page")).default;
    session.viewer = host;
    expect(await redirectOf(() => printersPage())).toBe("/forbidden?needs=admin");
    expect(await redirectOf(() => runLogPage())).toBeNull();
    expect(await redirectOf(() => calibrationPage())).toBeNull();
    session.viewer = supporter;
    expect(await redirectOf(() => runLogPage())).toBe("/forbidden?needs=host");
    expect(await redirectOf(() => calibrationPage())).toBe("/forbidden?needs=host");
    session.viewer = admin;
    expect(await redirectOf(() => printersPage())).toBeNull();
  });
});

describe("what backers see", () => {
  it("lists printing and next jobs with campaign, piece and printer names only, and each campaign's prints done of total", async () => {
    const { listPrintingNow, listQueuedCampaigns, listUpNext, campaignQueueProgress } = await import("@/db/queries/public-queue");
    const publicKeys = ["campaignSlug", "campaignTitle", "end", "id", "pieceName", "printerName", "start"];
    const printing = listPrintingNow(temp.db);
    const next = listUpNext(temp.db);
    expect(printing.length + next.length).toBeGreaterThan(0);
    for (const row of [...printing, ...next]) expect(Object.keys(row).sort()).toEqual(publicKeys);

    for (const campaign of listQueuedCampaigns(temp.db)) {
      const all = temp.db.select().from(jobs).where(eq(jobs.campaignId, campaign.id)).all();
      expect(campaign.jobsTotal).toBe(all.length);
      expect(campaign.jobsDone).toBe(all.filter((job) => job.state === "done").length);
      expect(campaignQueueProgress(temp.db, campaign.id)).toEqual({ jobsDone: campaign.jobsDone, jobsTotal: campaign.jobsTotal });
    }
  });
});
