import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { seedDemo } from "@/db/seed";
import { createTempDb } from "../helpers/temp-db";

const temp = createTempDb();
seedDemo(temp.db);
process.env.DATABASE_PATH = temp.file;

type Handler = (request: Request, segment: { params: Promise<Record<string, string>> }) => Promise<Response>;
let POST: Handler;
beforeAll(async () => {
  ({ POST } = (await import("@/app/api/estimate/route")) as unknown as { POST: Handler });
});
afterAll(() => temp.cleanup());

async function estimate(body: unknown) {
  const response = await POST(
    new Request("http://localhost/api/estimate", { method: "POST", body: typeof body === "string" ? body : JSON.stringify(body) }),
    { params: Promise.resolve({}) },
  );
  return { status: response.status, body: await response.json() };
}

describe("POST /api/estimate", () => {
  it("prices a plan on a lab printer with a breakdown whose lines sum to the goal", async () => {
    const { status, body } = await estimate({
      printerSlug: "bay-1-kestrel",
      material: "PLA",
      pieces: [{ name: "Overhang ladder", filamentGrams: 18 }, { name: "Bridge span set", filamentMetres: 4 }],
      variantCount: 3,
      repeats: 2,
    });
    expect(status).toBe(200);
    expect(body.jobs).toBe(2 * 3 * 2);
    expect(body.variantSwitches).toBe(2);
    const sum = body.cost.lines.reduce((total: number, line: { amountMinor: number }) => total + line.amountMinor, 0);
    expect(sum).toBe(body.cost.totalMinor);
    // Rounded up to a whole dollar (100 minor units, ISO 4217 exponent 2 for USD).
    expect(body.cost.totalMinor % 100).toBe(0);
    expect(body.hours.total).toBeCloseTo(body.hours.extrusion + body.hours.heatUp + body.hours.changeover + body.hours.handling, 2);
  });

  it("accepts flow as layer height × line width × speed (0.2 × 0.45 × 100 = 9 mm³/s, plain arithmetic)", async () => {
    const { status, body } = await estimate({
      printerSlug: "bay-1-kestrel",
      layerHeightMm: 0.2,
      flow: { lineWidthMm: 0.45, speedMmPerS: 100 },
      pieces: [{ name: "Cooling block", filamentGrams: 10 }],
    });
    expect(status).toBe(200);
    expect(body.protocolFlowMm3PerS).toBeCloseTo(9, 6);
    // 10 g PLA / 1.24 g/cm³ = 8064.5 mm³ per job; at 9 × 0.55 mm³/s that is 1629.2 s = 0.4526 h per job, 2 jobs.
    expect(body.hours.extrusion).toBeCloseTo((2 * 8064.516) / (9 * 0.55) / 3600, 2);
  });

  it("answers bad input with 422 naming each field", async () => {
    const { status, body } = await estimate({ material: "WOOD", pieces: [{ name: "", filamentGrams: -1 }], repeats: 0 });
    expect(status).toBe(422);
    expect(body.error.code).toBe("invalid_input");
    expect(Object.keys(body.error.fields)).toEqual(expect.arrayContaining(["material", "pieces.0.name", "pieces.0.filamentGrams", "repeats"]));
  });

  it("refuses a material the printer cannot print, and unknown printers", async () => {
    const open = await estimate({ printerSlug: "bay-1-kestrel", material: "ABS", pieces: [{ name: "Tower", filamentGrams: 5 }] });
    expect(open.status).toBe(422);
    expect(open.body.error.fields.material).toMatch(/PLA/);
    const unknown = await estimate({ printerSlug: "nope", pieces: [{ name: "Tower", filamentGrams: 5 }] });
    expect(unknown.status).toBe(422);
    expect(unknown.body.error.fields.printerSlug).toBeDefined();
  });

  it("answers malformed JSON with 400", async () => {
    const { status, body } = await estimate("{not json");
    expect(status).toBe(400);
    expect(body.error.code).toBe("malformed_json");
  });
});
