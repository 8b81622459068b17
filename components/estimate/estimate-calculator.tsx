"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useCallback, useEffect, useId, useRef, useState } from "react";
import { get, useFieldArray, useForm, useWatch } from "react-hook-form";
import { Plus, RefreshCw, Trash2 } from "lucide";
import type { z } from "zod";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Icon } from "@/components/ui/icon";
import { cn } from "@/lib/cn";
import type { CalculatorSummary } from "@/lib/estimate/calculator";
import { estimateRequestSchema, type EstimateRequest } from "@/lib/validation/estimate";
import { EstimateResult } from "./estimate-result";
import { Field, FieldError, inputClass, numberInputClass } from "./field";
import { HowComputed } from "./how-computed";
import { formatNumber } from "./numbers";
import { Quantity } from "./quantity";
import { SafetyNote } from "./safety-note";
import type { CalculatorMaterial, CalculatorPrinter } from "./types";

type FormValues = z.input<typeof estimateRequestSchema>;
type FlowMode = "direct" | "lineSpeed";
type AmountUnit = "g" | "m";
type Phase = "waiting" | "loading" | "ready" | "invalid" | "error";
type Shown = { summary: CalculatorSummary; plan: { pieces: number; variants: number; repeats: number } };
type ApiError = { code?: string; message?: string; fields?: Record<string, string> };

const DEBOUNCE_MS = 300;
const MAX_PIECES = 50;
// A line width a little over a 0.4 mm nozzle and a brisk speed (common practice on fast printers).
const DEFAULT_LINE_WIDTH_MM = 0.45;
const DEFAULT_SPEED_MM_PER_S = 150;

/** Friendlier words for the schema's built-in checks; the schema's own messages still win. */
const friendlyIssue: z.core.$ZodErrorMap = (issue) => {
  if (issue.code === "invalid_type" && issue.expected === "number") return "Enter a number.";
  if (issue.code === "invalid_type" && issue.expected === "int") return "Enter a whole number.";
  if (issue.code === "too_small" && issue.origin === "number") {
    return `${issue.inclusive ? "At least" : "More than"} ${String(issue.minimum)}.`;
  }
  if (issue.code === "too_big" && issue.origin === "number") return `At most ${String(issue.maximum)}.`;
  if (issue.code === "too_big" && issue.origin === "string") return `At most ${String(issue.maximum)} characters.`;
  return undefined;
};

/** Paths the form shows beside a field; a server message for any other path goes to the banner. */
const FIELD_PATH =
  /^(printerSlug|material|filamentDiameterMm|layerHeightMm|fanPercent|variantCount|repeats|pieces|flow(\.(mm3PerS|lineWidthMm|speedMmPerS))?|pieces\.\d+\.(name|filamentGrams|filamentMetres))$/;

type NumberFieldName = "layerHeightMm" | "fanPercent" | "flow.lineWidthMm" | "flow.speedMmPerS" | "variantCount" | "repeats";

function readApiError(payload: unknown): ApiError | undefined {
  if (typeof payload !== "object" || payload === null || !("error" in payload)) return undefined;
  const error = (payload as { error: unknown }).error;
  return typeof error === "object" && error !== null ? (error as ApiError) : undefined;
}

export function EstimateCalculator({ printers, materials }: { printers: CalculatorPrinter[]; materials: CalculatorMaterial[] }) {
  const uid = useId();
  const fieldId = (name: string) => `${uid}-${name.replaceAll(".", "-")}`;
  const firstPrinter = printers[0];
  const initialFlow = firstPrinter?.maxFlowMm3PerS ?? 20;

  const {
    register,
    control,
    getValues,
    setValue,
    subscribe,
    handleSubmit,
    formState: { errors },
  } = useForm<FormValues, unknown, EstimateRequest>({
    resolver: zodResolver(estimateRequestSchema, { error: friendlyIssue }),
    mode: "onChange",
    shouldFocusError: false,
    defaultValues: {
      printerSlug: firstPrinter?.slug,
      material: "PLA",
      filamentDiameterMm: 1.75,
      layerHeightMm: 0.2,
      flow: { mm3PerS: initialFlow },
      fanPercent: 100,
      pieces: [{ name: "Overhang test", filamentGrams: 12 }],
      variantCount: 2,
      repeats: 1,
    },
  });
  const pieces = useFieldArray({ control, name: "pieces" });
  const [printerSlug, material, layerHeightMm, flow, watchedPieces] = useWatch({
    control,
    name: ["printerSlug", "material", "layerHeightMm", "flow", "pieces"],
  });

  const [flowMode, setFlowMode] = useState<FlowMode>("direct");
  const [units, setUnits] = useState<Record<string, AmountUnit>>({});
  const [phase, setPhase] = useState<Phase>("waiting");
  const [shown, setShown] = useState<Shown | null>(null);
  const [serverErrors, setServerErrors] = useState<Record<string, string>>({});
  const [banner, setBanner] = useState<string | null>(null);

  const rememberedFlow = useRef({ mm3PerS: initialFlow, lineWidthMm: DEFAULT_LINE_WIDTH_MM, speedMmPerS: DEFAULT_SPEED_MM_PER_S });
  const flowEdited = useRef(false);
  const inFlight = useRef<AbortController | null>(null);
  const runNow = useRef<() => void>(() => {});

  const printer = printers.find((candidate) => candidate.slug === printerSlug);
  const chosenMaterial = materials.find((candidate) => candidate.id === material);

  const errorFor = (path: string): string | undefined =>
    (get(errors, path) as { message?: string } | undefined)?.message ?? serverErrors[path];

  /** A labelled number input bound to the form, with its error and optional hint. */
  const numberField = (
    name: NumberFieldName,
    label: string,
    options: { step: number; min: number; max: number; inputMode: "decimal" | "numeric"; hint?: string },
  ) => (
    <Field id={fieldId(name)} label={label} error={errorFor(name)} hint={options.hint}>
      {(control) => (
        <input
          {...control}
          type="number"
          inputMode={options.inputMode}
          step={options.step}
          min={options.min}
          max={options.max}
          className={numberInputClass}
          {...register(name, { valueAsNumber: true })}
        />
      )}
    </Field>
  );

  const send = useCallback(async (body: EstimateRequest) => {
    inFlight.current?.abort();
    const controller = new AbortController();
    inFlight.current = controller;
    setPhase("loading");
    try {
      const response = await fetch("/api/estimate", {
        method: "POST",
        headers: { "content-type": "application/json", accept: "application/json" },
        body: JSON.stringify(body),
        signal: controller.signal,
      });
      const payload: unknown = await response.json().catch(() => null);
      if (controller.signal.aborted) return;
      if (response.ok) {
        setShown({
          summary: payload as CalculatorSummary,
          plan: { pieces: body.pieces.length, variants: body.variantCount, repeats: body.repeats },
        });
        setServerErrors({});
        setBanner(null);
        setPhase("ready");
        return;
      }
      const error = readApiError(payload);
      if (response.status === 422 && error?.fields) {
        const fields = error.fields;
        setServerErrors(fields);
        const elsewhere = Object.entries(fields).filter(([path]) => !FIELD_PATH.test(path));
        setBanner(elsewhere.length > 0 ? elsewhere.map(([path, message]) => `${path}: ${message}`).join(" ") : null);
        setPhase("invalid");
        return;
      }
      setBanner(error?.message ?? `The estimate could not be computed (HTTP ${response.status}).`);
      setPhase("error");
    } catch {
      if (controller.signal.aborted) return;
      setBanner("Could not reach the lab's estimate service. Check your connection and try again.");
      setPhase("error");
    } finally {
      if (inFlight.current === controller) inFlight.current = null;
    }
  }, []);

  // Live estimate: every change waits for a pause in typing, then posts the form if it is valid.
  useEffect(() => {
    const run = () => {
      const parsed = estimateRequestSchema.safeParse(getValues());
      if (!parsed.success) {
        inFlight.current?.abort();
        setPhase("invalid");
        return;
      }
      void send(parsed.data);
    };
    runNow.current = run;
    let timer = setTimeout(run, 0);
    const unsubscribe = subscribe({
      formState: { values: true },
      callback: ({ name }) => {
        clearTimeout(timer);
        // A server message about the field just edited (or the printer–material pair) is now stale.
        const stale = name === "printerSlug" || name === "material" ? ["printerSlug", "material"] : name ? [name] : [];
        setServerErrors((previous) => {
          if (!stale.some((path) => path in previous)) return previous;
          const next = { ...previous };
          for (const path of stale) delete next[path];
          return next;
        });
        setPhase("waiting");
        timer = setTimeout(run, DEBOUNCE_MS);
      },
    });
    return () => {
      clearTimeout(timer);
      unsubscribe();
      inFlight.current?.abort();
    };
  }, [getValues, subscribe, send]);

  function changeFlowMode(mode: FlowMode) {
    if (mode === flowMode) return;
    const current = getValues("flow");
    if (current && "mm3PerS" in current) rememberedFlow.current.mm3PerS = current.mm3PerS;
    if (current && "lineWidthMm" in current) {
      rememberedFlow.current.lineWidthMm = current.lineWidthMm;
      rememberedFlow.current.speedMmPerS = current.speedMmPerS;
    }
    const { mm3PerS, lineWidthMm, speedMmPerS } = rememberedFlow.current;
    setValue("flow", mode === "direct" ? { mm3PerS } : { lineWidthMm, speedMmPerS }, { shouldValidate: true });
    setFlowMode(mode);
  }

  function changePrinter(slug: string) {
    const next = printers.find((candidate) => candidate.slug === slug);
    // Until the flow is typed in, it follows the chosen printer's maximum.
    if (next && !flowEdited.current) {
      rememberedFlow.current.mm3PerS = next.maxFlowMm3PerS;
      if (flowMode === "direct") setValue("flow", { mm3PerS: next.maxFlowMm3PerS }, { shouldValidate: true });
    }
  }

  const unitOf = (id: string): AmountUnit => units[id] ?? "g";
  // A row just added and not yet typed into is incomplete rather than wrong: no red until it is used.
  const isBlankRow = (index: number) => {
    const piece = watchedPieces?.[index];
    const hasAmount = [piece?.filamentGrams, piece?.filamentMetres].some((value) => value !== undefined && Number.isFinite(value));
    return piece !== undefined && !piece.name?.trim() && !hasAmount;
  };

  function changeUnit(index: number, id: string, unit: AmountUnit) {
    const piece = getValues(`pieces.${index}`);
    const amount = unitOf(id) === "g" ? piece.filamentGrams : piece.filamentMetres;
    setUnits((previous) => ({ ...previous, [id]: unit }));
    setValue(
      `pieces.${index}`,
      { name: piece.name, filamentGrams: unit === "g" ? amount : undefined, filamentMetres: unit === "m" ? amount : undefined },
      { shouldValidate: true },
    );
  }

  if (!firstPrinter) {
    return (
      <Card>
        <p className="text-muted">The lab has no printers set up yet, so there is nothing to price a test plan on.</p>
      </Card>
    );
  }

  const lineFlow =
    flow && "lineWidthMm" in flow && [layerHeightMm, flow.lineWidthMm, flow.speedMmPerS].every((value) => Number.isFinite(value) && (value ?? 0) > 0)
      ? (layerHeightMm ?? 0) * flow.lineWidthMm * flow.speedMmPerS
      : undefined;
  const busy = phase === "waiting" || phase === "loading";
  const piecesError = (errors.pieces?.root?.message ?? errors.pieces?.message) || serverErrors.pieces;

  return (
    <div className="grid items-start gap-6 lg:grid-cols-[minmax(0,1fr)_minmax(0,27rem)]">
      <Card className="p-0">
        <form
          noValidate
          aria-label="Test plan"
          onSubmit={(event) => void handleSubmit((data) => send(data))(event)}
          className="flex flex-col divide-y divide-line"
        >
          <FormSection title="Printer and material" gap="gap-4">
            <Field
              id={fieldId("printerSlug")}
              label="Printer"
              error={errorFor("printerSlug")}
              hint={printer ? `${printer.model} · up to ${formatNumber(printer.maxFlowMm3PerS, 1)} mm³/s · prints ${printer.materials.join(", ")}` : undefined}
            >
              {(control) => (
                <select
                  {...control}
                  className={inputClass}
                  {...register("printerSlug", { onChange: (event: React.ChangeEvent<HTMLSelectElement>) => changePrinter(event.target.value) })}
                >
                  {printers.map((option) => (
                    <option key={option.slug} value={option.slug}>
                      {option.name}
                    </option>
                  ))}
                </select>
              )}
            </Field>
            <div className="grid gap-4 sm:grid-cols-[minmax(0,1fr)_10rem]">
              <Field
                id={fieldId("material")}
                label="Material"
                error={errorFor("material")}
                hint={
                  chosenMaterial
                    ? `Density ${formatNumber(chosenMaterial.densityGPerCm3, 2)} g/cm³ · nozzle ${chosenMaterial.nozzleMinCelsius}–${chosenMaterial.nozzleMaxCelsius} °C`
                    : undefined
                }
              >
                {(control) => (
                  <select {...control} className={inputClass} {...register("material")}>
                    {materials.map((option) => (
                      <option key={option.id} value={option.id}>
                        {option.id} — {option.name}
                      </option>
                    ))}
                  </select>
                )}
              </Field>
              <Field id={fieldId("filamentDiameterMm")} label="Filament diameter" error={errorFor("filamentDiameterMm")}>
                {(control) => (
                  <select {...control} className={numberInputClass} {...register("filamentDiameterMm", { valueAsNumber: true })}>
                    <option value={1.75}>1.75 mm</option>
                    <option value={2.85}>2.85 mm</option>
                  </select>
                )}
              </Field>
            </div>
          </FormSection>

          <FormSection title="Protocol" gap="gap-4">
            <div className="grid grid-cols-2 gap-4">
              {numberField("layerHeightMm", "Layer height (mm)", { step: 0.01, min: 0.04, max: 1, inputMode: "decimal" })}
              {numberField("fanPercent", "Part-cooling fan (%)", { step: 1, min: 0, max: 100, inputMode: "decimal" })}
            </div>

            <fieldset className="flex flex-col gap-3 rounded-lg border border-line p-4" aria-describedby={errorFor("flow") ? `${fieldId("flow")}-error` : undefined}>
              <legend className="px-1 text-sm font-medium">Volumetric flow</legend>
              <div className="flex flex-col gap-2 text-sm sm:flex-row sm:gap-5">
                <label className="inline-flex items-center gap-2">
                  <input
                    type="radio"
                    name={`${uid}-flow-mode`}
                    value="direct"
                    checked={flowMode === "direct"}
                    onChange={() => changeFlowMode("direct")}
                    className="h-4 w-4 accent-teal"
                  />
                  State flow directly
                </label>
                <label className="inline-flex items-center gap-2">
                  <input
                    type="radio"
                    name={`${uid}-flow-mode`}
                    value="lineSpeed"
                    checked={flowMode === "lineSpeed"}
                    onChange={() => changeFlowMode("lineSpeed")}
                    className="h-4 w-4 accent-teal"
                  />
                  From line width × speed
                </label>
              </div>
              {flowMode === "direct" ? (
                <Field
                  key="direct"
                  id={fieldId("flow.mm3PerS")}
                  label="Maximum volumetric flow (mm³/s)"
                  error={errorFor("flow.mm3PerS")}
                  hint={`The estimate uses the lower of this and the printer's ${formatNumber(printer?.maxFlowMm3PerS ?? initialFlow, 1)} mm³/s.`}
                  className="sm:max-w-xs"
                >
                  {(control) => (
                    <input
                      {...control}
                      type="number"
                      inputMode="decimal"
                      step="any"
                      min={0}
                      max={200}
                      className={numberInputClass}
                      {...register("flow.mm3PerS", {
                        valueAsNumber: true,
                        onChange: () => {
                          flowEdited.current = true;
                        },
                      })}
                    />
                  )}
                </Field>
              ) : (
                <div key="lineSpeed" className="flex flex-col gap-3">
                  <div className="grid grid-cols-2 gap-4">
                    {numberField("flow.lineWidthMm", "Line width (mm)", { step: 0.01, min: 0.1, max: 3, inputMode: "decimal" })}
                    {numberField("flow.speedMmPerS", "Print speed (mm/s)", { step: 1, min: 1, max: 2000, inputMode: "decimal" })}
                  </div>
                  <p className="rounded-md bg-teal-soft/60 px-3 py-2 text-sm">
                    Flow = layer height × line width × speed ={" "}
                    <output
                      htmlFor={`${fieldId("layerHeightMm")} ${fieldId("flow.lineWidthMm")} ${fieldId("flow.speedMmPerS")}`}
                      className="font-semibold text-teal-strong"
                      data-testid="computed-flow"
                    >
                      {lineFlow === undefined ? "—" : <Quantity value={formatNumber(lineFlow, 2)} unit="mm³/s" />}
                    </output>
                  </p>
                </div>
              )}
              <FieldError id={`${fieldId("flow")}-error`} message={errorFor("flow")} />
            </fieldset>
          </FormSection>

          <FormSection
            title="Test pieces"
            gap="gap-3"
            aria-describedby={piecesError ? `${fieldId("pieces")}-error` : undefined}
            aside="Filament for one print of each piece"
          >
            <ol className="flex flex-col gap-3">
              {pieces.fields.map((field, index) => {
                const unit = unitOf(field.id);
                const amountPath = unit === "g" ? `pieces.${index}.filamentGrams` as const : `pieces.${index}.filamentMetres` as const;
                const blank = isBlankRow(index);
                const nameError = blank ? undefined : errorFor(`pieces.${index}.name`);
                const amountError = blank ? undefined : (errorFor(`pieces.${index}.filamentGrams`) ?? errorFor(`pieces.${index}.filamentMetres`));
                return (
                  <li key={field.id} className="rounded-lg border border-line bg-paper/50 p-3">
                    <div className="grid grid-cols-[minmax(0,1fr)_5.5rem_auto] items-start gap-x-3 gap-y-3 sm:grid-cols-[minmax(0,1fr)_7.5rem_5.5rem_auto]">
                      <Field
                        id={fieldId(`pieces.${index}.name`)}
                        label={`Piece ${index + 1} name`}
                        error={nameError}
                        className="col-span-3 sm:col-span-1"
                      >
                        {(control) => <input {...control} type="text" autoComplete="off" className={inputClass} {...register(`pieces.${index}.name`)} />}
                      </Field>
                      <Field
                        key={`${field.id}-${unit}`}
                        id={fieldId(`pieces.${index}.amount`)}
                        label={unit === "g" ? "Filament (g)" : "Filament (m)"}
                        error={amountError}
                      >
                        {(control) => (
                          <input
                            {...control}
                            type="number"
                            inputMode="decimal"
                            step="any"
                            min={0}
                            className={numberInputClass}
                            {...register(amountPath, { valueAsNumber: true })}
                          />
                        )}
                      </Field>
                      <Field id={fieldId(`pieces.${index}.unit`)} label="Unit">
                        {(control) => (
                          <select
                            {...control}
                            value={unit}
                            onChange={(event) => changeUnit(index, field.id, event.target.value === "m" ? "m" : "g")}
                            className={inputClass}
                          >
                            <option value="g">grams</option>
                            <option value="m">metres</option>
                          </select>
                        )}
                      </Field>
                      <div className="flex flex-col gap-1">
                        <span className="text-sm font-medium" aria-hidden="true">
                          &nbsp;
                        </span>
                        <Button
                          type="button"
                          variant="quiet"
                          className="h-[38px] px-2.5"
                          onClick={() => pieces.remove(index)}
                          disabled={pieces.fields.length === 1}
                          aria-label={`Remove piece ${index + 1}`}
                          title="Remove this piece"
                        >
                          <Icon node={Trash2} />
                        </Button>
                      </div>
                    </div>
                    {blank ? <p className="mt-2 text-xs text-muted">Give this piece a name and its filament, or remove it.</p> : null}
                  </li>
                );
              })}
            </ol>
            <FieldError id={`${fieldId("pieces")}-error`} message={piecesError} />
            <div>
              <Button
                type="button"
                variant="secondary"
                size="sm"
                onClick={() => pieces.append({ name: "", filamentGrams: Number.NaN })}
                disabled={pieces.fields.length >= MAX_PIECES}
              >
                <Icon node={Plus} /> Add a piece
              </Button>
            </div>
          </FormSection>

          <FormSection title="Plan shape" gap="gap-4">
            <div className="grid grid-cols-2 gap-4">
              {numberField("variantCount", "Variants", { step: 1, min: 1, max: 12, inputMode: "numeric", hint: "Including the reference: stock part + 2 under test = 3." })}
              {numberField("repeats", "Repeats", { step: 1, min: 1, max: 20, inputMode: "numeric", hint: "Prints of each piece per variant." })}
            </div>
          </FormSection>
        </form>
      </Card>

      <div className="flex flex-col gap-4">
        <Card aria-labelledby={`${uid}-result-heading`} role="region">
          <div className="mb-4 flex items-baseline justify-between gap-3">
            <h3 id={`${uid}-result-heading`} className="text-lg font-semibold">
              Estimate
            </h3>
            <p className="text-xs text-muted" data-testid="estimate-status">
              {busy ? "Updating…" : phase === "invalid" ? "Waiting for valid input" : phase === "ready" ? "Up to date" : ""}
            </p>
          </div>
          {banner ? (
            <div role="alert" className="mb-4 flex flex-col items-start gap-2 rounded-lg border border-rose/30 bg-rose-soft px-3 py-2 text-sm text-rose">
              <p>{banner}</p>
              {phase === "error" ? (
                <Button type="button" variant="secondary" size="sm" onClick={() => runNow.current()}>
                  <Icon node={RefreshCw} /> Try again
                </Button>
              ) : null}
            </div>
          ) : null}
          <div aria-live="polite" aria-busy={busy}>
            {phase === "invalid" ? (
              <p className="mb-4 rounded-lg bg-slate-soft px-3 py-2 text-sm">
                Fill in every field, and fix any marked in red, to update the estimate.
              </p>
            ) : null}
            {shown ? (
              <div className={cn("transition-opacity", (busy || phase === "invalid") && "opacity-55")}>
                <EstimateResult summary={shown.summary} plan={shown.plan} />
              </div>
            ) : phase === "error" || phase === "invalid" ? null : (
              <p className="text-sm text-muted">Working out the estimate…</p>
            )}
          </div>
        </Card>
        {material ? <SafetyNote material={material} /> : null}
        <HowComputed />
      </div>
    </div>
  );
}

function FormSection({
  title,
  gap,
  aside,
  children,
  ...rest
}: {
  title: string;
  gap: string;
  aside?: string;
  children: React.ReactNode;
  "aria-describedby"?: string;
}) {
  return (
    <div className="p-5">
      <fieldset {...rest}>
        <legend className="mb-4 flex w-full flex-wrap items-baseline justify-between gap-x-3 text-sm font-semibold uppercase tracking-wide text-muted">
          {title}
          {aside ? <span className="text-xs font-normal normal-case tracking-normal">{aside}</span> : null}
        </legend>
        <div className={cn("flex flex-col", gap)}>{children}</div>
      </fieldset>
    </div>
  );
}
