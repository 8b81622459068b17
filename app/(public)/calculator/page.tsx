import type { Metadata } from "next";
import { Calculator, Fan } from "lucide";
import { DuctHelper } from "@/components/estimate/duct-helper";
import { EstimateCalculator } from "@/components/estimate/estimate-calculator";
import { ModelUploadPanel } from "@/components/estimate/model-upload-panel";
import type { CalculatorMaterial, CalculatorPrinter } from "@/components/estimate/types";
import { Icon } from "@/components/ui/icon";
import { getDb } from "@/db";
import { listPrinters } from "@/db/queries/pricing";
import { MATERIAL_IDS, MATERIALS } from "@/lib/estimate/materials";
import { fanNoiseCaution } from "@/lib/safety";

export const metadata: Metadata = {
  title: "Calculator",
  description: "Price a test plan the way Harbor Street Print Lab does, and size a part-cooling duct.",
};

export default function CalculatorPage() {
  const printers: CalculatorPrinter[] = listPrinters(getDb()).map((printer) => ({
    slug: printer.slug,
    name: printer.name,
    model: printer.model,
    maxFlowMm3PerS: printer.maxFlowMm3PerS,
    materials: printer.materials,
  }));
  const materials: CalculatorMaterial[] = MATERIAL_IDS.map((id) => {
    const material = MATERIALS[id];
    return {
      id,
      name: material.name,
      densityGPerCm3: material.densityGPerCm3,
      nozzleMinCelsius: material.nozzleTemperatureCelsius.min,
      nozzleMaxCelsius: material.nozzleTemperatureCelsius.max,
    };
  });

  return (
    <div className="flex flex-col gap-12">
      <header className="flex max-w-3xl flex-col gap-3">
        <h1 className="text-3xl font-bold tracking-tight sm:text-4xl">Calculator</h1>
        <p className="text-lg text-muted">
          Price a test plan the way the lab does — from each piece&apos;s filament, the printer&apos;s flow and the lab&apos;s rates to
          the funding goal backers see — and check how fast the air leaves a part-cooling duct.
        </p>
        <nav aria-label="On this page" className="flex flex-wrap gap-x-5 gap-y-1 text-sm font-medium">
          <a href="#estimate" className="text-teal underline-offset-4 hover:underline">
            Price a test plan
          </a>
          <a href="#model-upload" className="text-teal underline-offset-4 hover:underline">
            Measure a model file
          </a>
          <a href="#duct" className="text-teal underline-offset-4 hover:underline">
            Duct helper
          </a>
        </nav>
      </header>

      <section id="estimate" aria-labelledby="estimate-heading" className="flex scroll-mt-6 flex-col gap-4">
        <div className="max-w-3xl">
          <h2 id="estimate-heading" className="flex items-center gap-2 text-2xl font-semibold">
            <Icon node={Calculator} className="h-5 w-5 text-teal" /> Price a test plan
          </h2>
          <p className="mt-1 text-muted">
            Every piece is printed once per variant and repeat. The estimate updates as you type, with the lab&apos;s current
            rates; a campaign&apos;s published goal may differ once the host has set the plan.
          </p>
        </div>
        <EstimateCalculator printers={printers} materials={materials} />
      </section>

      <ModelUploadPanel />

      <section id="duct" aria-labelledby="duct-heading" className="flex scroll-mt-6 flex-col gap-4">
        <div className="max-w-3xl">
          <h2 id="duct-heading" className="flex items-center gap-2 text-2xl font-semibold">
            <Icon node={Fan} className="h-5 w-5 text-teal" /> Duct helper
          </h2>
          <p className="mt-1 text-muted">
            Compare a duct&apos;s inlet with its outlets: the area ratio sets how much faster the air leaves than it enters.
          </p>
          <p className="mt-2 text-sm text-ember">
            <strong className="font-semibold">{fanNoiseCaution.title}:</strong> {fanNoiseCaution.text}
          </p>
        </div>
        <DuctHelper />
      </section>
    </div>
  );
}
