"use client";

import { Plus, Trash2 } from "lucide";
import { get, useFieldArray, useWatch, type Control, type FieldErrors, type UseFormRegister } from "react-hook-form";
import { DuctAirflowCaveat, DuctAirflowFigures, dimensionsOf, shapeLabels, type ShapeKind } from "@/components/estimate/duct-figures";
import { Field, inputClass, numberInputClass } from "@/components/estimate/field";
import { formatNumber } from "@/components/estimate/numbers";
import { Quantity } from "@/components/estimate/quantity";
import { Button } from "@/components/ui/button";
import { Icon } from "@/components/ui/icon";
import { ductAirflow, openingAreaMm2, type DuctAirflow, type OpeningShape } from "@/lib/estimate/duct";
import { emptyOpening, type OpeningValues, type ProposalFormValues, type ProposalPayload } from "./form-values";

const MAX_OUTLETS = 8;

type Props = {
  control: Control<ProposalFormValues, unknown, ProposalPayload>;
  register: UseFormRegister<ProposalFormValues>;
  errors: FieldErrors<ProposalFormValues>;
};

const positive = (value: number | undefined): value is number => typeof value === "number" && Number.isFinite(value) && value > 0;

/** The opening as the duct module takes it, when every dimension its shape needs is a usable number. */
function shapeOf(opening: OpeningValues | undefined): OpeningShape | undefined {
  if (!opening) return undefined;
  if (opening.kind === "circle") return positive(opening.diameterMm) ? { kind: "circle", diameterMm: opening.diameterMm } : undefined;
  if (!positive(opening.widthMm) || !positive(opening.heightMm)) return undefined;
  return { kind: opening.kind, widthMm: opening.widthMm, heightMm: opening.heightMm };
}

function safeArea(shape: OpeningShape | undefined): number | undefined {
  if (!shape) return undefined;
  try {
    return openingAreaMm2(shape);
  } catch {
    return undefined;
  }
}

const message = (errors: FieldErrors<ProposalFormValues>, path: string): string | undefined => {
  const error: unknown = get(errors, path);
  return error && typeof error === "object" && "message" in error && typeof error.message === "string" ? error.message : undefined;
};

/** The duct helper's inputs inside the proposal form, with its figures computed as you type. */
export function DuctFields({ control, register, errors }: Props) {
  const outlets = useFieldArray({ control, name: "ductDetails.outlets" });
  const details = useWatch({ control, name: "ductDetails" });

  const inletShape = shapeOf(details?.inlet);
  const outletShapes = (details?.outlets ?? []).map(shapeOf);
  const rating = details?.fan.rating;
  let airflow: DuctAirflow | undefined;
  let computeError: string | undefined;
  if (inletShape && outletShapes.length > 0 && outletShapes.every((shape) => shape !== undefined) && rating && positive(rating.value)) {
    try {
      airflow = ductAirflow(inletShape, outletShapes as OpeningShape[], { unit: rating.unit, value: rating.value });
    } catch (error) {
      computeError = error instanceof Error ? error.message : "These sizes cannot be used.";
    }
  }
  const outletsError = message(errors, "ductDetails.outlets") ?? message(errors, "ductDetails.outlets.root");

  return (
    <fieldset className="flex flex-col gap-4 rounded-lg border border-line p-4">
      <legend className="px-1 text-base font-semibold">Duct details</legend>
      <p className="-mt-1 text-sm text-muted">
        The sizes the duct helper uses: the inlet where the fan blows in, each outlet, and the fan&apos;s rated flow. A draft may
        leave them all empty; once you type one, fill in the rest.
      </p>
      <div className="grid items-start gap-4 xl:grid-cols-[minmax(0,1fr)_minmax(0,22rem)]">
        <div className="flex flex-col gap-4">
          <OpeningFields
            path="ductDetails.inlet"
            legend="Inlet"
            kind={details?.inlet.kind ?? "rectangle"}
            areaMm2={safeArea(inletShape)}
            register={register}
            errors={errors}
          />
          <ol className="flex flex-col gap-3" aria-label="Outlets">
            {outlets.fields.map((field, index) => (
              <li key={field.id}>
                <OpeningFields
                  path={`ductDetails.outlets.${index}`}
                  legend={`Outlet ${index + 1}`}
                  kind={details?.outlets[index]?.kind ?? "rectangle"}
                  areaMm2={safeArea(outletShapes[index])}
                  register={register}
                  errors={errors}
                  onRemove={outlets.fields.length > 1 ? () => outlets.remove(index) : undefined}
                />
              </li>
            ))}
          </ol>
          {outletsError ? <p className="text-xs font-medium text-rose">{outletsError}</p> : null}
          <div>
            <Button
              type="button"
              variant="secondary"
              size="sm"
              onClick={() => outlets.append(emptyOpening())}
              disabled={outlets.fields.length >= MAX_OUTLETS}
            >
              <Icon node={Plus} /> Add an outlet
            </Button>
          </div>
          <fieldset className="rounded-lg border border-line bg-paper/50 p-4">
            <legend className="px-1 text-sm font-medium">Fan</legend>
            <div className="grid gap-3 sm:grid-cols-[minmax(0,1.5fr)_minmax(0,1fr)_7rem]">
              <Field id="duct-fan-description" label="Fan" hint="For example “50 mm radial blower”." error={message(errors, "ductDetails.fan.description")}>
                {(controlProps) => <input {...controlProps} {...register("ductDetails.fan.description")} className={inputClass} maxLength={120} />}
              </Field>
              <Field
                id="duct-fan-value"
                label="Rated flow"
                hint="The free-air figure from the datasheet."
                error={message(errors, "ductDetails.fan.rating.value")}
              >
                {(controlProps) => (
                  <input
                    {...controlProps}
                    {...register("ductDetails.fan.rating.value", { valueAsNumber: true })}
                    type="number"
                    inputMode="decimal"
                    step="any"
                    min={0}
                    className={numberInputClass}
                  />
                )}
              </Field>
              <Field id="duct-fan-unit" label="Unit">
                {(controlProps) => (
                  <select {...controlProps} {...register("ductDetails.fan.rating.unit")} className={inputClass}>
                    <option value="cfm">CFM</option>
                    <option value="m3/h">m³/h</option>
                  </select>
                )}
              </Field>
            </div>
          </fieldset>
        </div>
        <div className="flex flex-col gap-3 rounded-lg bg-paper p-4 xl:sticky xl:top-6" role="region" aria-labelledby="duct-figures-heading">
          <h3 id="duct-figures-heading" className="font-semibold">
            Air through the duct
          </h3>
          <div aria-live="polite" className="flex flex-col gap-3">
            {airflow ? (
              <DuctAirflowFigures airflow={airflow} />
            ) : (
              <p className="text-sm text-muted">{computeError ?? "Fill in the inlet, every outlet and the fan's flow to see the areas and air speeds."}</p>
            )}
          </div>
          <DuctAirflowCaveat />
        </div>
      </div>
    </fieldset>
  );
}

function OpeningFields({
  path,
  legend,
  kind,
  areaMm2,
  register,
  errors,
  onRemove,
}: {
  path: "ductDetails.inlet" | `ductDetails.outlets.${number}`;
  legend: string;
  kind: ShapeKind;
  areaMm2?: number;
  register: UseFormRegister<ProposalFormValues>;
  errors: FieldErrors<ProposalFormValues>;
  onRemove?: () => void;
}) {
  const idPrefix = path.replace(/\./g, "-");
  return (
    <fieldset className="rounded-lg border border-line bg-paper/50 p-4">
      <legend className="px-1 text-sm font-medium">{legend}</legend>
      <div className="grid grid-cols-2 gap-3 sm:grid-cols-[minmax(0,1.4fr)_minmax(0,1fr)_minmax(0,1fr)]">
        <Field id={`${idPrefix}-shape`} label="Shape" className="col-span-2 sm:col-span-1" error={message(errors, `${path}.kind`)}>
          {(controlProps) => (
            <select {...controlProps} {...register(`${path}.kind`)} className={inputClass}>
              {(Object.keys(shapeLabels) as ShapeKind[]).map((shape) => (
                <option key={shape} value={shape}>
                  {shapeLabels[shape]}
                </option>
              ))}
            </select>
          )}
        </Field>
        {dimensionsOf[kind].map(({ key, label }) => (
          <Field key={`${kind}-${key}`} id={`${idPrefix}-${key}`} label={label} error={message(errors, `${path}.${key}`)}>
            {(controlProps) => (
              <input
                {...controlProps}
                {...register(`${path}.${key}`, { valueAsNumber: true })}
                type="number"
                inputMode="decimal"
                step="any"
                min={0}
                className={numberInputClass}
              />
            )}
          </Field>
        ))}
      </div>
      <div className="mt-3 flex items-center justify-between gap-3 text-sm">
        <p className="text-muted">
          Area <span className="text-ink">{areaMm2 === undefined ? "—" : <Quantity value={formatNumber(areaMm2, 1)} unit="mm²" />}</span>
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
