import { eq } from "drizzle-orm";
import type { ReactElement } from "react";
import { renderToString } from "react-dom/server";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { seedDemo } from "@/db/seed";
import { jobs, users } from "@/db/schema";
import type { Viewer } from "@/server/auth";
import { createTempDb } from "../helpers/temp-db";

const session = vi.hoisted(() => ({ viewer: null as Viewer | null }));
vi.mock("@/server/auth", () => ({ getViewer: async () => session.viewer, auth: async () => null }));
vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));
vi.mock("next/navigation", () => ({
  useRouter: () => ({ refresh: () => undefined, push: () => undefined }),
  redirect: (to: string) => {
    throw new Error(`redirect ${to}`);
  },
  notFound: () => {
    throw new Error("not found");
  },
}));

const temp = createTempDb();
seedDemo(temp.db);
process.env.DATABASE_PATH = temp.file;
afterAll(() => temp.cleanup());

const admin = temp.db.select().from(users).where(eq(users.email, "owner@harbor-street.example")).get()!;
beforeAll(() => {
  session.viewer = { id: admin.id, email: admin.email ?? "", name: admin.name, role: admin.role };
});

const html = async (page: () => Promise<ReactElement> | ReactElement) => renderToString(await page());
const text = (markup: string) => markup.replace(/<[^>]+>/g, " ").replace(/&#x27;|&#39;/g, "'").replace(/\s+/g, " ");

describe("the queue screens render from the seeded lab", () => {
  it("printers: every seeded printer, its cautions and the maintenance form", async () => {
    const out = text(await html((await import("@/app/lab/printers/page")).default));
    for (const name of ["Bay 1 — Kestrel", "Bay 2 — Wren", "Bay 3 — Heron"]) expect(out).toContain(name);
    expect(out).toContain("At the printers");
    expect(out).toContain("Fire precautions");
    expect(out).toContain("Loud blower fans");
    expect(out).toContain("Add block");
  });

  it("calendar: the lab's time zone and the seeded 08:00–20:00 windows", async () => {
    const out = text(await html((await import("@/app/lab/calendar/page")).default));
    expect(out).toContain("America/Chicago");
    expect(out).toContain("08:00–20:00");
    expect(out).toContain("Make a feed link");
  });

  it("run log and a running job's page with its finish form", async () => {
    const list = text(await html((await import("@/app/lab/jobs/page")).default));
    expect(list).toContain("Printing");
    const running = temp.db.select().from(jobs).where(eq(jobs.state, "running")).get()!;
    const JobPage = (await import("@/app/lab/jobs/[id]/page")).default;
    const out = text(await html(() => JobPage({ params: Promise.resolve({ id: running.id }) })));
    expect(out).toContain("Printing — attempt 1");
    expect(out).toContain("Log this run");
    expect(out).toContain("Safety at the printer");
  });

  it("calibration: one panel per printer with runs and r²", async () => {
    const out = text(await html((await import("@/app/lab/calibration/page")).default));
    expect(out).toContain("Calibration");
    expect(out).toMatch(/Runs \d+/);
    expect(out).toContain("r²");
  });

  it("public queue: printing now, up next and expected results", async () => {
    const out = text(await html((await import("@/app/(public)/queue/page")).default));
    expect(out).toContain("Printing now");
    expect(out).toContain("Expected results");
    expect(out).toMatch(/\d+ of \d+ prints done/);
    expect(out).not.toContain("@");
  });
});

