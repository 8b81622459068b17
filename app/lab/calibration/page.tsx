import type { Metadata } from "next";
import { ApplyCalibrationButton } from "@/components/lab/queue-screens/apply-calibration";
import { CalibrationChart } from "@/components/lab/queue-screens/calibration-chart";
import { Card } from "@/components/ui/card";
import { getDb } from "@/db";
import { printerCalibration } from "@/db/queries/calibration";
import { listPrinters } from "@/db/queries/pricing";
import { hasRole } from "@/lib/roles";
import { MIN_CALIBRATION_RUNS } from "@/lib/schedule/calibration";
import { requirePageRole } from "@/server/guards";

export const metadata: Metadata = { title: "Calibration · Lab" };

const SETTLED = 0.005;

export default async function CalibrationPage() {
  const viewer = await requirePageRole("host", "/lab/calibration");
  const canApply = hasRole(viewer.role, "admin");
  const db = getDb();
  const printers = listPrinters(db).map((printer) => printerCalibration(db, printer));

  return (
    <div className="flex flex-col gap-6">
      <header className="flex flex-col gap-2">
        <h1 className="text-2xl font-bold">Calibration</h1>
        <p className="max-w-3xl text-muted">
          Each finished run compares the hours it was estimated at with the hours it took. A least-squares line through the origin
          (actual ≈ k × estimated) gives each printer&apos;s correction: its efficiency becomes the current one divided by k. At least{" "}
          {MIN_CALIBRATION_RUNS} runs are needed; one fit moves the estimates by at most a factor of two. Runs logged at an older efficiency are
          restated at the current one first, so applying a fit twice changes nothing. {canApply ? "" : "Only an admin applies a fit."}
        </p>
      </header>
      {printers.map(({ printer, points, fit }) => {
        const fitted = fit.r2 !== null || fit.runs >= MIN_CALIBRATION_RUNS;
        const settled = Math.abs(fit.efficiency - printer.efficiency) < SETTLED;
        return (
          <Card key={printer.id} className="flex flex-col gap-4" data-testid={`calibration-${printer.slug}`}>
            <div className="flex flex-wrap items-start justify-between gap-3">
              <div>
                <h2 className="text-lg font-semibold">{printer.name}</h2>
                <p className="text-sm text-muted">{printer.model}</p>
              </div>
              <dl className="grid grid-cols-2 gap-x-6 gap-y-1 text-sm sm:grid-cols-4">
                <Fact label="Runs" value={String(fit.runs)} />
                <Fact label="Fitted k" value={fitted ? fit.factor.toFixed(3) : "—"} />
                <Fact label="r²" value={fit.r2 === null ? "—" : fit.r2.toFixed(3)} />
                <Fact label="Efficiency" value={`${printer.efficiency.toFixed(3)}${fitted && !settled ? ` → ${fit.efficiency.toFixed(3)}` : ""}`} />
              </dl>
            </div>
            {points.length > 0 ? (
              <CalibrationChart title={printer.name} points={points} factor={fitted ? fit.factor : null} />
            ) : (
              <p className="text-sm text-muted">No finished runs logged on this printer yet.</p>
            )}
            {!fitted ? (
              <p className="text-sm text-muted">
                {fit.runs} of {MIN_CALIBRATION_RUNS} runs needed for a fit.
              </p>
            ) : settled ? (
              <p className="text-sm text-moss">The stored efficiency matches the fit.</p>
            ) : canApply ? (
              <ApplyCalibrationButton printerId={printer.id} printerName={printer.name} efficiency={fit.efficiency} disabled={false} />
            ) : (
              <p className="text-sm text-muted">An admin can apply efficiency {fit.efficiency.toFixed(3)}.</p>
            )}
          </Card>
        );
      })}
    </div>
  );
}

function Fact({ label, value }: { label: string; value: string }) {
  return (
    <div>
      <dt className="text-xs font-medium uppercase tracking-wide text-muted">{label}</dt>
      <dd className="font-mono">{value}</dd>
    </div>
  );
}
