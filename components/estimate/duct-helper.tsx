"use client";

import { useId, useRef, useState } from "react";
import { Plus, Trash2 } from "lucide";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Icon } from "@/components/ui/icon";
import { ductAirflow, openingAreaMm2, type DuctAirflow, type FanFlowRating, type OpeningShape } from "@/lib/estimate/duct";
import { Field, inputClass, numberInputClass } from "./field";
import { DuctAirflowCaveat, DuctAirflowFigures, dimensionsOf, shapeLabels, type Dimension, type ShapeKind } from "./duct-figures";
import { formatNumber } from "./numbers";
import { Quantity } from "./quantity";

type FanUnit = FanFlowRating["unit"];
type OpeningDraft = { id: number; kind: ShapeKind; widthMm: string; heightMm: string; diameterMm: string };
type DimensionErrors = Partial<Record<Dimension, string>>;

const MAX_OUTLETS = 8;
const MAX_SIZE_MM = 1000;

function parseMm(raw: string): number | string {
  if (raw.trim() === "") return "Enter a size in mm.";
  const value = Number(raw);
  if (!Number.isFinite(value)) return "Enter a number.";
  if (value <= 0) return "Must be more than 0 mm.";
  if (value > MAX_SIZE_MM) return `At most ${MAX_SIZE_MM} mm.`;
  return value;
}

/** The opening as the duct module takes it, or the message for each dimension that is not usable. */
function parseOpening(draft: OpeningDraft): { shape?: OpeningShape; errors: DimensionErrors } {
  const errors: DimensionErrors = {};
  const values: Partial<Record<Dimension, number>> = {};
  for (const { key } of dimensionsOf[draft.kind]) {
    const parsed = parseMm(draft[key]);
    if (typeof parsed === "string") errors[key] = parsed;
    else values[key] = parsed;
  }
  if (Object.keys(errors).length > 0) return { errors };
  const { widthMm = 0, heightMm = 0, diameterMm = 0 } = values;
  if (draft.kind === "circle") return { shape: { kind: "circle", diameterMm }, errors };
  if (draft.kind === "slot" && widthMm < heightMm) {
    return { errors: { widthMm: "A slot is at least as long as it is thick." } };
  }
  return { shape: { kind: draft.kind, widthMm, heightMm }, errors };
}

function parseFan(raw: string): number | string {
  if (raw.trim() === "") return "Enter the fan's rated flow.";
  const value = Number(raw);
  if (!Number.isFinite(value)) return "Enter a number.";
  if (value <= 0) return "Must be more than 0.";
  return value;
}

function safeArea(shape: OpeningShape | undefined): number | undefined {
  if (!shape) return undefined;
  try {
    return openingAreaMm2(shape);
  } catch {
    return undefined;
  }
}

/** Inlet and outlet areas of a part-cooling duct and the air speeds through them, by continuity. */
export function DuctHelper() {
  const uid = useId();
  const [inlet, setInlet] = useState<OpeningDraft>({ id: 0, kind: "rectangle", widthMm: "20", heightMm: "15", diameterMm: "20" });
  const [outlets, setOutlets] = useState<OpeningDraft[]>([
    { id: 1, kind: "rectangle", widthMm: "22", heightMm: "3", diameterMm: "6" },
    { id: 2, kind: "rectangle", widthMm: "22", heightMm: "3", diameterMm: "6" },
  ]);
  const [fanValue, setFanValue] = useState("5");
  const [fanUnit, setFanUnit] = useState<FanUnit>("cfm");
  const nextId = useRef(3);

  const parsedInlet = parseOpening(inlet);
  const parsedOutlets = outlets.map(parseOpening);
  const fan = parseFan(fanValue);
  const fanError = typeof fan === "string" ? fan : undefined;

  let airflow: DuctAirflow | undefined;
  let computeError: string | undefined;
  const outletShapes = parsedOutlets.map((parsed) => parsed.shape);
  if (parsedInlet.shape && typeof fan === "number" && outletShapes.every((shape) => shape !== undefined)) {
    try {
      airflow = ductAirflow(parsedInlet.shape, outletShapes as OpeningShape[], { unit: fanUnit, value: fan });
    } catch (error) {
      computeError = error instanceof Error ? error.message : "These sizes cannot be used.";
    }
  }

  const updateOutlet = (id: number, next: OpeningDraft) => setOutlets((all) => all.map((outlet) => (outlet.id === id ? next : outlet)));
  const addOutlet = () => {
    const id = nextId.current++;
    setOutlets((all) => [...all, { ...(all.at(-1) ?? { kind: "rectangle", widthMm: "", heightMm: "", diameterMm: "" }), id }]);
  };

  return (
    <div className="grid items-start gap-6 lg:grid-cols-[minmax(0,1fr)_minmax(0,27rem)]">
      <Card className="flex flex-col gap-5">
        <OpeningEditor
          idPrefix={`${uid}-inlet`}
          legend="Inlet"
          description="Where the fan blows into the duct."
          draft={inlet}
          errors={parsedInlet.errors}
          areaMm2={safeArea(parsedInlet.shape)}
          onChange={setInlet}
        />
        <div className="flex flex-col gap-3">
          <h3 className="text-sm font-semibold uppercase tracking-wide text-muted">Outlets</h3>
          <ol className="flex flex-col gap-3">
            {outlets.map((outlet, index) => (
              <li key={outlet.id}>
                <OpeningEditor
                  idPrefix={`${uid}-outlet-${outlet.id}`}
                  legend={`Outlet ${index + 1}`}
                  draft={outlet}
                  errors={parsedOutlets[index]?.errors ?? {}}
                  areaMm2={safeArea(parsedOutlets[index]?.shape)}
                  onChange={(next) => updateOutlet(outlet.id, next)}
                  onRemove={outlets.length > 1 ? () => setOutlets((all) => all.filter((candidate) => candidate.id !== outlet.id)) : undefined}
                />
              </li>
            ))}
          </ol>
          <div>
            <Button type="button" variant="secondary" size="sm" onClick={addOutlet} disabled={outlets.length >= MAX_OUTLETS}>
              <Icon node={Plus} /> Add an outlet
            </Button>
          </div>
        </div>
        <fieldset className="rounded-lg border border-line p-4">
          <legend className="px-1 text-sm font-medium">Fan</legend>
          <div className="grid grid-cols-[minmax(0,1fr)_7rem] gap-3 sm:max-w-sm">
            <Field
              id={`${uid}-fan-value`}
              label="Rated flow"
              error={fanError}
              hint="The free-air figure from the fan's datasheet."
            >
              {(control) => (
                <input
                  {...control}
                  type="number"
                  inputMode="decimal"
                  step="any"
                  min={0}
                  value={fanValue}
                  onChange={(event) => setFanValue(event.target.value)}
                  className={numberInputClass}
                />
              )}
            </Field>
            <Field id={`${uid}-fan-unit`} label="Unit">
              {(control) => (
                <select
                  {...control}
                  value={fanUnit}
                  onChange={(event) => setFanUnit(event.target.value === "m3/h" ? "m3/h" : "cfm")}
                  className={inputClass}
                >
                  <option value="cfm">CFM</option>
                  <option value="m3/h">m³/h</option>
                </select>
              )}
            </Field>
          </div>
        </fieldset>
      </Card>

      <Card className="flex flex-col gap-4 lg:sticky lg:top-6" role="region" aria-labelledby={`${uid}-duct-result`}>
        <h3 id={`${uid}-duct-result`} className="text-lg font-semibold">
          Air through the duct
        </h3>
        <div aria-live="polite" className="flex flex-col gap-4">
          {airflow ? (
            <DuctAirflowFigures airflow={airflow} />
          ) : (
            <p className="text-sm text-muted">{computeError ?? "Fix the marked sizes to see the areas and air speeds."}</p>
          )}
        </div>
        <DuctAirflowCaveat />
      </Card>
    </div>
  );
}

function OpeningEditor({
  idPrefix,
  legend,
  description,
  draft,
  errors,
  areaMm2,
  onChange,
  onRemove,
}: {
  idPrefix: string;
  legend: string;
  description?: string;
  draft: OpeningDraft;
  errors: DimensionErrors;
  areaMm2?: number;
  onChange: (next: OpeningDraft) => void;
  onRemove?: () => void;
}) {
  const dimensions = dimensionsOf[draft.kind];
  return (
    <fieldset className="rounded-lg border border-line bg-paper/50 p-4">
      <legend className="px-1 text-sm font-medium">{legend}</legend>
      {description ? <p className="-mt-1 mb-3 text-xs text-muted">{description}</p> : null}
      <div className="grid grid-cols-2 gap-3 sm:grid-cols-[minmax(0,1.4fr)_minmax(0,1fr)_minmax(0,1fr)]">
        <Field id={`${idPrefix}-shape`} label="Shape" className="col-span-2 sm:col-span-1">
          {(control) => (
            <select
              {...control}
              value={draft.kind}
              onChange={(event) => {
                const kind = event.target.value;
                if (kind === "rectangle" || kind === "circle" || kind === "slot") onChange({ ...draft, kind });
              }}
              className={inputClass}
            >
              {(Object.keys(shapeLabels) as ShapeKind[]).map((kind) => (
                <option key={kind} value={kind}>
                  {shapeLabels[kind]}
                </option>
              ))}
            </select>
          )}
        </Field>
        {dimensions.map(({ key, label }) => (
          <Field key={key} id={`${idPrefix}-${key}`} label={label} error={errors[key]}>
            {(control) => (
              <input
                {...control}
                type="number"
                inputMode="decimal"
                step="any"
                min={0}
                value={draft[key]}
                onChange={(event) => onChange({ ...draft, [key]: event.target.value })}
                className={numberInputClass}
              />
            )}
          </Field>
        ))}
      </div>
      <div className="mt-3 flex items-center justify-between gap-3 text-sm">
        <p className="text-muted">
          Area{" "}
          <span className="text-ink">{areaMm2 === undefined ? "—" : <Quantity value={formatNumber(areaMm2, 1)} unit="mm²" />}</span>
        </p>
        {onRemove ? (
          <Button type="button" variant="quiet" size="sm" onClick={onRemove}>
            <Icon node={Trash2} /> Remove {legend.toLowerCase()}
          </Button>
        ) : null}
      </div>
    </fieldset>
  );
}
