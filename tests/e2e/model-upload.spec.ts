import { expect, test } from "@playwright/test";
import { binaryStl } from "../unit/estimate/helpers/mesh-files";
import { cube } from "../unit/estimate/helpers/meshes";

test("a visitor uploads an STL on the calculator and sees it measured", async ({ page }) => {
  await page.goto("/calculator#model-upload");
  const panel = page.locator("#model-upload");
  // A 20 mm cube: V = a³ = 8000 mm³ = 8 cm³ (plain geometry).
  await panel.getByLabel("Model file (STL or 3MF)").setInputFiles({
    name: "cube-20.stl",
    mimeType: "model/stl",
    buffer: Buffer.from(binaryStl(cube(20))),
  });
  await panel.getByRole("button", { name: "Measure" }).click();
  await expect(panel.getByRole("heading", { name: "cube-20.stl" })).toBeVisible();
  await expect(panel.getByText("8 cm³", { exact: true })).toBeVisible();
  await expect(panel.getByText("20 × 20 × 20 mm")).toBeVisible();
  await expect(panel.getByText(/closed and consistently oriented/)).toBeVisible();
});

test("a file that is not a mesh is refused with the reason beside the file field", async ({ page }) => {
  await page.goto("/calculator#model-upload");
  const panel = page.locator("#model-upload");
  await panel.getByLabel("Model file (STL or 3MF)").setInputFiles({
    name: "photo.stl",
    mimeType: "model/stl",
    buffer: Buffer.from("\x89PNG\r\n\x1a\n this is a picture, not a mesh ".repeat(20)),
  });
  await panel.getByRole("button", { name: "Measure" }).click();
  await expect(panel.getByRole("alert")).toBeVisible();
  await expect(panel.locator("#model-file-error")).toBeVisible();
});
