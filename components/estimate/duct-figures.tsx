import type { DuctAirflow, OpeningShape } from "@/lib/estimate/duct";
import { formatNumber, formatSignificant } from "./numbers";
import { Quantity } from "./quantity";

/*
 * Pieces of the duct helper shared with the proposal form and page. No hooks and no "use client":
 * server pages and client forms both render them.
 */

export type ShapeKind = OpeningShape["kind"];
export type Dimension = "widthMm" | "heightMm" | "diameterMm";

const SECONDS_PER_HOUR = 3600;

export const shapeLabels: Record<ShapeKind, string> = {
  rectangle: "Rectangle (width × height)",
  circle: "Circle (diameter)",
  slot: "Slot (length × thickness, round ends)",
};

export const dimensionsOf: Record<ShapeKind, { key: Dimension; label: string }[]> = {
  rectangle: [
    { key: "widthMm", label: "Width (mm)" },
    { key: "heightMm", label: "Height (mm)" },
  ],
  circle: [{ key: "diameterMm", label: "Diameter (mm)" }],
  slot: [
    { key: "widthMm", label: "Length (mm)" },
    { key: "heightMm", label: "Thickness (mm)" },
  ],
};

/** The areas, flow and air speeds of a duct, and how much faster the air leaves than it enters. */
export function DuctAirflowFigures({ airflow }: { airflow: DuctAirflow }) {
  return (
    <>
      <dl className="grid grid-cols-2 gap-x-4 gap-y-3 text-sm">
        <Figure label="Inlet area" value={formatNumber(airflow.inletAreaMm2, 1)} unit="mm²" testId="duct-inlet-area" />
        <Figure label="Total outlet area" value={formatNumber(airflow.outletAreaMm2, 1)} unit="mm²" testId="duct-outlet-area" />
        <Figure label="Outlet ÷ inlet area" value={formatSignificant(airflow.outletToInletRatio, 3)} testId="duct-ratio" />
        <Figure
          label="Fan flow"
          value={formatSignificant(airflow.flowM3PerS * SECONDS_PER_HOUR, 3)}
          unit="m³/h"
          testId="duct-flow"
        />
        <Figure label="Inlet air speed" value={formatNumber(airflow.inletSpeedMPerS, 2, 2)} unit="m/s" testId="duct-inlet-speed" />
        <Figure label="Outlet air speed" value={formatNumber(airflow.outletSpeedMPerS, 2, 2)} unit="m/s" testId="duct-outlet-speed" />
      </dl>
      <p className="rounded-lg bg-teal-soft/60 px-3 py-2 text-sm">
        Exit speed is{" "}
        <strong className="text-teal-strong" data-testid="duct-exit-relative">
          <Quantity value={formatNumber(airflow.exitSpeedRelativeToInlet, 2, 2)} unit="×" />
        </strong>{" "}
        the inlet speed
        {airflow.exitSpeedRelativeToInlet < 1 ? ": the outlets are larger than the inlet, so the air slows down." : "."}
      </p>
    </>
  );
}

/** The continuity caveat printed under the figures. */
export function DuctAirflowCaveat() {
  return (
    <p className="text-sm text-muted">
      By continuity (Q = A·v) the same air flow through a smaller total outlet area leaves faster. A fan&apos;s rated flow is
      measured in free air; against a duct&apos;s back-pressure it delivers less, so read these speeds as upper bounds — their
      ratio holds whatever the real flow.
    </p>
  );
}

function Figure({ label, value, unit, testId }: { label: string; value: string; unit?: string; testId: string }) {
  return (
    <div className="rounded-lg bg-paper px-3 py-2">
      <dt className="text-xs font-medium uppercase tracking-wide text-muted">{label}</dt>
      <dd className="mt-0.5 text-base font-semibold" data-testid={testId}>
        <Quantity value={value} unit={unit} />
      </dd>
    </div>
  );
}
