import { expect, test, type Page } from "@playwright/test";
import { formatMoney } from "../../lib/format";

type CostLine = { label: string; amountMinor: number };

/** The plan the tests type into the form, as the API takes it. */
const plan = {
  printerSlug: "bay-1-kestrel",
  material: "PLA",
  filamentDiameterMm: 1.75,
  layerHeightMm: 0.2,
  flow: { mm3PerS: 32 },
  fanPercent: 100,
  pieces: [{ name: "Bridge span", filamentGrams: 18 }],
  variantCount: 3,
  repeats: 2,
};

async function fillPlan(page: Page) {
  const form = page.getByRole("form", { name: "Test plan" });
  await form.getByLabel("Printer", { exact: true }).selectOption(plan.printerSlug);
  await form.getByLabel("Material", { exact: true }).selectOption(plan.material);
  await form.getByLabel("Filament diameter", { exact: true }).selectOption("1.75");
  await form.getByLabel("Layer height (mm)").fill("0.2");
  await form.getByLabel("Maximum volumetric flow (mm³/s)").fill("32");
  await form.getByLabel("Part-cooling fan (%)").fill("100");
  await form.getByLabel("Piece 1 name").fill("Bridge span");
  await form.getByLabel("Filament (g)").fill("18");
  await form.getByLabel("Variants", { exact: true }).fill("3");
  await form.getByLabel("Repeats", { exact: true }).fill("2");
  return form;
}

async function expectBreakdown(page: Page, expected: { jobs: number; cost: { currency: string; totalMinor: number; lines: CostLine[] } }) {
  const result = page.getByRole("region", { name: "Estimate", exact: true });
  await expect(result.getByTestId("estimate-total")).toHaveText(formatMoney(expected.cost.totalMinor, expected.cost.currency));
  await expect(result.getByTestId("estimate-status")).toHaveText("Up to date");
  await expect(result.getByTestId("estimate-jobs")).toHaveText(String(expected.jobs));
  const rows = result.getByTestId("estimate-breakdown").locator("tbody tr");
  await expect(rows).toHaveCount(expected.cost.lines.length);
  for (const [index, line] of expected.cost.lines.entries()) {
    await expect(rows.nth(index)).toContainText(line.label);
    await expect(rows.nth(index)).toContainText(formatMoney(line.amountMinor, expected.cost.currency));
  }
}

test("a visitor prices a test plan and sees the same breakdown the estimate API computes", async ({ page, request }) => {
  await page.goto("/calculator");
  await expect(page).toHaveTitle(/^Calculator · Proofbay/);
  await expect(page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Calculator" })).toBeVisible();
  await fillPlan(page);

  const api = await request.post("/api/estimate", { data: plan });
  expect(api.status()).toBe(200);
  const expected = await api.json();
  // 1 piece × 3 variants × 2 repeats (the plan's own arithmetic).
  expect(expected.jobs).toBe(6);
  await expectBreakdown(page, expected);
  await expect(page.getByTestId("estimate-goal")).toHaveText(formatMoney(expected.cost.totalMinor, expected.cost.currency));

  // A second piece given in metres is priced like the API prices it.
  const form = page.getByRole("form", { name: "Test plan" });
  await form.getByRole("button", { name: "Add a piece" }).click();
  const second = form.getByRole("listitem").nth(1);
  await second.getByLabel("Piece 2 name").fill("Cooling block");
  await second.getByLabel("Unit").selectOption("m");
  await second.getByLabel("Filament (m)").fill("4");
  const withMetres = await request.post("/api/estimate", {
    data: { ...plan, pieces: [...plan.pieces, { name: "Cooling block", filamentMetres: 4 }] },
  });
  expect(withMetres.status()).toBe(200);
  const expectedWithMetres = await withMetres.json();
  expect(expectedWithMetres.jobs).toBe(12);
  await expectBreakdown(page, expectedWithMetres);
});

test("flow from line width × speed is computed live and used for the estimate", async ({ page }) => {
  await page.goto("/calculator");
  const form = await fillPlan(page);
  await form.getByLabel("From line width × speed").check();
  await form.getByLabel("Line width (mm)").fill("0.45");
  await form.getByLabel("Print speed (mm/s)").fill("100");
  // 0.2 mm × 0.45 mm × 100 mm/s = 9 mm³/s (plain arithmetic).
  await expect(form.getByTestId("computed-flow")).toHaveText("9 mm³/s");
  await expect(page.getByTestId("estimate-protocol-flow")).toHaveText("9 mm³/s");
  await form.getByLabel("Layer height (mm)").fill("0.3");
  // 0.3 × 0.45 × 100 = 13.5 mm³/s.
  await expect(form.getByTestId("computed-flow")).toHaveText("13.5 mm³/s");
  await expect(page.getByTestId("estimate-protocol-flow")).toHaveText("13.5 mm³/s");
});

test("bad input shows field messages beside the fields: the schema's on the client, the printer's from the server", async ({ page }) => {
  await page.goto("/calculator");
  const form = await fillPlan(page);
  await expect(page.getByTestId("estimate-status")).toHaveText("Up to date");

  const grams = form.getByLabel("Filament (g)");
  await grams.fill("-5");
  await expect(form.getByText("Filament must be more than 0 g.")).toBeVisible();
  await expect(grams).toHaveAttribute("aria-invalid", "true");
  await expect(grams).toHaveAccessibleDescription("Filament must be more than 0 g.");
  await expect(page.getByTestId("estimate-status")).toHaveText("Waiting for valid input");
  await grams.fill("18");
  await expect(form.getByText("Filament must be more than 0 g.")).toHaveCount(0);

  // The Kestrel does not print ABS (seeded printer): the server's 422 lands beside the material.
  const material = form.getByLabel("Material", { exact: true });
  await material.selectOption("ABS");
  await expect(material).toHaveAccessibleDescription(/Bay 1 — Kestrel prints PLA, PETG, TPU\./);
  await expect(page.getByText("Fumes and ultrafine particles:")).toBeVisible();
  await form.getByLabel("Printer", { exact: true }).selectOption("bay-3-heron");
  await expect(page.getByTestId("estimate-status")).toHaveText("Up to date");
  await expect(form.getByText(/Kestrel prints/)).toHaveCount(0);
});

test("the duct helper gives areas, their ratio and air speeds by continuity", async ({ page }) => {
  await page.goto("/calculator");
  const duct = page.locator("#duct");
  const inlet = duct.getByRole("group", { name: "Inlet", exact: true });
  await inlet.getByLabel("Shape").selectOption("circle");
  await inlet.getByLabel("Diameter (mm)").fill("50");
  for (const name of ["Outlet 1", "Outlet 2"]) {
    const outlet = duct.getByRole("group", { name, exact: true });
    await outlet.getByLabel("Shape").selectOption("rectangle");
    await outlet.getByLabel("Width (mm)").fill("20");
    await outlet.getByLabel("Height (mm)").fill("10");
  }
  await duct.getByLabel("Rated flow").fill("10");
  await duct.getByLabel("Unit").selectOption("cfm");

  // Plain geometry: π · 25² = 1963.5 mm²; two 20 × 10 mm outlets = 400 mm².
  const inletArea = Math.PI * 25 ** 2;
  const outletArea = 2 * 20 * 10;
  await expect(duct.getByTestId("duct-inlet-area")).toHaveText("1,963.5 mm²");
  await expect(duct.getByTestId("duct-outlet-area")).toHaveText("400 mm²");
  await expect(duct.getByTestId("duct-ratio")).toHaveText((outletArea / inletArea).toPrecision(3)); // 0.204
  await expect(duct.getByTestId("duct-exit-relative")).toHaveText(`${(inletArea / outletArea).toFixed(2)} ×`); // 4.91
  // 1 ft = 0.3048 m exactly (NIST SP 811), so 10 CFM = 10 × 0.3048³ / 60 m³/s; v = Q / A.
  const flowM3PerS = (10 * 0.3048 ** 3) / 60;
  await expect(duct.getByTestId("duct-inlet-speed")).toHaveText(`${(flowM3PerS / (inletArea / 1e6)).toFixed(2)} m/s`); // 2.40
  await expect(duct.getByTestId("duct-outlet-speed")).toHaveText(`${(flowM3PerS / (outletArea / 1e6)).toFixed(2)} m/s`); // 11.80
  await expect(duct.getByText("By continuity (Q = A·v) the same air flow through a smaller total outlet area leaves faster.")).toBeVisible();

  // A zero size is refused beside the field, without losing the page.
  const second = duct.getByRole("group", { name: "Outlet 2", exact: true });
  await second.getByLabel("Width (mm)").fill("0");
  await expect(second.getByText("Must be more than 0 mm.")).toBeVisible();
  await expect(second.getByLabel("Width (mm)")).toHaveAccessibleDescription("Must be more than 0 mm.");
  await expect(duct.getByTestId("duct-ratio")).toHaveCount(0);
  await second.getByRole("button", { name: "Remove outlet 2" }).click();
  await expect(duct.getByTestId("duct-outlet-area")).toHaveText("200 mm²");
});
