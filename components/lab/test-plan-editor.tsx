"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { keepPreviousData, useQuery } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useEffect, useId, useMemo, useState } from "react";
import { get, useFieldArray, useForm, useWatch, type Resolver } from "react-hook-form";
import { AlertTriangle, Plus, Trash2 } from "lucide";
import type { z } from "zod";
import { publishTestPlanAction } from "@/app/lab/proposals/[id]/plan/actions";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Icon } from "@/components/ui/icon";
import type { PlanEstimateSummary } from "@/db/queries/test-plans";
import { libraryGramsIn } from "@/lib/campaign/plan-pieces";
import { cn } from "@/lib/cn";
import type { MaterialId } from "@/lib/estimate/materials";
import { formatMoney } from "@/lib/format";
import { materialCautions } from "@/lib/safety";
import {
  DEADLINE_MAX_DAYS,
  DEADLINE_MIN_DAYS,
  PLAN_MAX_PIECES,
  PLAN_MAX_VARIANTS,
  publishTestPlanSchema,
  testPlanDraftSchema,
  type PublishTestPlanInput,
  type TestPlanDraft,
} from "@/lib/validation/test-plan";
import { LabApiError, labFetch } from "./api";
import { PlanEstimatePanel, type EstimatePhase } from "./plan-estimate-panel";

export type EditorPrinter = { id: string; name: string; model: string; materials: string[]; maxFlowMm3PerS: number; status: string };
export type EditorPiece = { id: string; name: string; description: string; filamentGrams: number };
export type EditorMaterial = { id: MaterialId; name: string };

type Props = {
  proposal: { id: string; title: string };
  printers: EditorPrinter[];
  library: EditorPiece[];
  materials: EditorMaterial[];
  currency: string;
  timeZone: string;
  window: { today: string; earliest: string; latest: string };
  defaults: {
    printerId: string;
    material: MaterialId;
    referenceName: string;
    title: string;
    summary: string;
    deadline: string;
  };
};

type FormValues = {
  printerId: string;
  material: MaterialId;
  layerHeightMm: number;
  maxFlowMm3PerS: number;
  fanPercent: number;
  repeats: number;
  /** followsLibrary: the grams still follow the library's PLA figure when the material changes. */
  pieces: { libraryPieceId: string; filamentGrams: number; followsLibrary: boolean }[];
  variants: { name: string }[];
  title: string;
  summary: string;
  deadline: string;
  overrideGoal: boolean;
  goalOverride: string;
  goalOverrideReason: string;
};

const ESTIMATE_DEBOUNCE_MS = 350;
/** Paths shown beside a field; a server message about anything else goes above the estimate. */
const FIELD_PATH = /^(printerId|material|layerHeightMm|maxFlowMm3PerS|fanPercent|repeats|pieces|variants|title|summary|deadline|goalOverride|goalOverrideReason|(pieces|variants)\.\d+\.\w+)$/;

const inputClass =
  "w-full rounded-lg border border-line bg-surface px-3 py-2 text-sm text-ink aria-invalid:border-rose aria-invalid:bg-rose-soft/30";
const numberClass = cn(inputClass, "font-mono tabular-nums");

/** Friendlier words for zod's built-in checks; the schema's own messages win. */
const friendlyIssue: z.core.$ZodErrorMap = (issue) => {
  if (issue.code === "invalid_type" && issue.expected === "number") return "Enter a number.";
  return undefined;
};

function draftFrom(values: FormValues): unknown {
  return {
    printerId: values.printerId,
    material: values.material,
    layerHeightMm: values.layerHeightMm,
    maxFlowMm3PerS: values.maxFlowMm3PerS,
    fanPercent: values.fanPercent,
    repeats: values.repeats,
    pieces: (values.pieces ?? []).map(({ libraryPieceId, filamentGrams }) => ({ libraryPieceId, filamentGrams })),
    variants: values.variants ?? [],
  };
}

function publishFrom(values: FormValues): unknown {
  const draft = draftFrom(values) as Record<string, unknown>;
  return {
    ...draft,
    title: values.title,
    summary: values.summary,
    deadline: values.deadline,
    goalOverride: values.overrideGoal ? values.goalOverride : undefined,
    goalOverrideReason: values.overrideGoal ? values.goalOverrideReason : undefined,
  };
}

export function TestPlanEditor({ proposal, printers, library, materials, currency, timeZone, window: dates, defaults }: Props) {
  const uid = useId();
  const id = (name: string) => `${uid}-${name.replaceAll(".", "-")}`;
  const router = useRouter();
  const libraryById = useMemo(() => new Map(library.map((piece) => [piece.id, piece])), [library]);
  const firstPrinter = printers.find((printer) => printer.id === defaults.printerId) ?? printers[0];

  // The shared publish schema, plus what only the browser knows: the printer's materials and the date window.
  const resolver = useMemo<Resolver<FormValues, unknown, PublishTestPlanInput>>(() => {
    const schema = publishTestPlanSchema.superRefine((value, context) => {
      const printer = printers.find((candidate) => candidate.id === value.printerId);
      if (printer && !printer.materials.includes(value.material)) {
        context.addIssue({ code: "custom", path: ["material"], message: `${printer.name} does not print ${value.material}; it prints ${printer.materials.join(", ")}.` });
      }
      if (value.deadline < dates.earliest || value.deadline > dates.latest) {
        context.addIssue({
          code: "custom",
          path: ["deadline"],
          message: `Pick a date from ${dates.earliest} to ${dates.latest} (${DEADLINE_MIN_DAYS} to ${DEADLINE_MAX_DAYS} days ahead).`,
        });
      }
    });
    const base = zodResolver(schema, { error: friendlyIssue });
    return (values, context, options) =>
      base(publishFrom(values) as never, context, options as never) as ReturnType<Resolver<FormValues, unknown, PublishTestPlanInput>>;
  }, [printers, dates.earliest, dates.latest]);

  const {
    register,
    control,
    getValues,
    setValue,
    subscribe,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting, isSubmitSuccessful },
  } = useForm<FormValues, unknown, PublishTestPlanInput>({
    resolver,
    // Errors appear after the first publish attempt, then follow each edit; until then the estimate says what is missing.
    mode: "onSubmit",
    reValidateMode: "onChange",
    shouldFocusError: true,
    defaultValues: {
      printerId: firstPrinter?.id ?? "",
      material: defaults.material,
      layerHeightMm: 0.2,
      maxFlowMm3PerS: firstPrinter?.maxFlowMm3PerS ?? 20,
      fanPercent: 100,
      repeats: 3,
      pieces: [],
      variants: [{ name: defaults.referenceName }, { name: "" }],
      title: defaults.title,
      summary: defaults.summary,
      deadline: defaults.deadline,
      overrideGoal: false,
      goalOverride: "",
      goalOverrideReason: "",
    },
  });
  const pieces = useFieldArray({ control, name: "pieces" });
  const variants = useFieldArray({ control, name: "variants" });
  const [printerId, material, watchedPieces, repeats, overrideGoal, maxFlow] = useWatch({
    control,
    name: ["printerId", "material", "pieces", "repeats", "overrideGoal", "maxFlowMm3PerS"],
  });
  const printer = printers.find((candidate) => candidate.id === printerId);
  const [flowEdited, setFlowEdited] = useState(false);
  const [pick, setPick] = useState("");
  const [banner, setBanner] = useState<string | null>(null);
  const [publishServerErrors, setPublishServerErrors] = useState<Record<string, string>>({});

  /* ---------- Live estimate: a debounced copy of the valid draft, priced by the server ---------- */
  const [draft, setDraft] = useState<TestPlanDraft | null>(() => {
    const parsed = testPlanDraftSchema.safeParse(draftFrom(getValues()));
    return parsed.success ? parsed.data : null;
  });
  const [phase, setPhase] = useState<"incomplete" | "waiting" | "settled">(() => (draft ? "settled" : "incomplete"));
  const [draftIssue, setDraftIssue] = useState<string | undefined>();
  useEffect(() => {
    let timer: ReturnType<typeof setTimeout> | undefined;
    const unsubscribe = subscribe({
      formState: { values: true },
      callback: ({ values }) => {
        clearTimeout(timer);
        setPhase("waiting");
        timer = setTimeout(() => {
          const parsed = testPlanDraftSchema.safeParse(draftFrom(values as FormValues));
          if (parsed.success) {
            setDraft(parsed.data);
            setDraftIssue(undefined);
            setPhase("settled");
          } else {
            setDraft(null);
            setDraftIssue(parsed.error.issues[0]?.message);
            setPhase("incomplete");
          }
        }, ESTIMATE_DEBOUNCE_MS);
      },
    });
    return () => {
      clearTimeout(timer);
      unsubscribe();
    };
  }, [subscribe]);

  const draftKey = draft ? JSON.stringify(draft) : null;
  const estimate = useQuery({
    queryKey: ["plan-estimate", draftKey],
    queryFn: ({ signal }) => labFetch<PlanEstimateSummary>("/api/lab/test-plans/estimate", { method: "POST", body: draftKey ?? "{}", signal }),
    enabled: draftKey !== null,
    placeholderData: keepPreviousData,
    staleTime: 30_000,
    retry: false,
  });
  const estimateError = estimate.error instanceof LabApiError ? estimate.error : undefined;
  const estimateFieldErrors = estimate.isError && !estimate.isFetching ? (estimateError?.body.fields ?? {}) : {};
  const estimatePhase: EstimatePhase =
    phase === "incomplete"
      ? "incomplete"
      : phase === "waiting"
        ? "waiting"
        : estimate.isFetching
          ? "loading"
          : estimate.isError
            ? estimateError?.status === 422
              ? "invalid"
              : "error"
            : "ready";
  const strayEstimateErrors = Object.entries(estimateFieldErrors).filter(([path]) => !FIELD_PATH.test(path));
  const estimateMessage =
    estimatePhase === "incomplete"
      ? draftIssue && `Still needed: ${draftIssue}`
      : estimate.isError && !estimate.isFetching
        ? strayEstimateErrors.length > 0 || Object.keys(estimateFieldErrors).length === 0
          ? (strayEstimateErrors.map(([, message]) => message).join(" ") || estimate.error.message)
          : undefined
        : undefined;

  const errorFor = (path: string): string | undefined =>
    (get(errors, path) as { message?: string } | undefined)?.message ?? publishServerErrors[path] ?? estimateFieldErrors[path];

  /* ---------- Edits that move other fields ---------- */
  function changeMaterial(next: MaterialId) {
    getValues("pieces").forEach((piece, index) => {
      const fromLibrary = libraryById.get(piece.libraryPieceId);
      if (piece.followsLibrary && fromLibrary) setValue(`pieces.${index}.filamentGrams`, libraryGramsIn(next, fromLibrary.filamentGrams));
    });
  }

  function changePrinter(nextId: string) {
    const next = printers.find((candidate) => candidate.id === nextId);
    if (next && !flowEdited) setValue("maxFlowMm3PerS", next.maxFlowMm3PerS, { shouldValidate: true });
  }

  function addPiece() {
    const fromLibrary = libraryById.get(pick);
    if (!fromLibrary) return;
    pieces.append({ libraryPieceId: fromLibrary.id, filamentGrams: libraryGramsIn(getValues("material"), fromLibrary.filamentGrams), followsLibrary: true });
    setPick("");
  }

  const onPublish = handleSubmit(async (input) => {
    setBanner(null);
    setPublishServerErrors({});
    const result = await publishTestPlanAction(proposal.id, input);
    if (result.ok) {
      router.push(`/campaigns/${result.data.slug}`);
      return;
    }
    const fields = result.fields ?? {};
    setPublishServerErrors(fields);
    const stray = Object.entries(fields).filter(([path]) => !FIELD_PATH.test(path));
    const message = Object.keys(fields).length === 0 || stray.length > 0 ? result.message : "Some fields need fixing; nothing was published.";
    setBanner(message);
    // A root error marks the submission as failed, so the button comes back for another try.
    setError("root", { type: "server", message });
  });

  const usedIds = new Set((watchedPieces ?? []).map((piece) => piece.libraryPieceId));
  const available = library.filter((piece) => !usedIds.has(piece.id));
  const cautions = materialCautions(material ?? defaults.material).filter((caution) => caution.id === "fumes" || caution.id === "ptfe");
  const computedGoal = estimate.data?.cost.totalMinor;
  const counts = { pieces: watchedPieces?.length ?? 0, variants: variants.fields.length, repeats: Number.isFinite(repeats) ? repeats : 0 };
  const piecesError = errorFor("pieces") ?? (errors.pieces?.root?.message as string | undefined);
  const variantsError = errorFor("variants") ?? (errors.variants?.root?.message as string | undefined);

  const field = (path: string) => {
    const error = errorFor(path);
    return {
      id: id(path),
      "aria-invalid": error ? (true as const) : undefined,
      "aria-describedby": error ? `${id(path)}-error` : undefined,
    };
  };
  const errorText = (path: string) => {
    const error = errorFor(path);
    return error ? (
      <p id={`${id(path)}-error`} className="text-xs font-medium text-rose">
        {error}
      </p>
    ) : null;
  };

  return (
    <form
      noValidate
      aria-label="Test plan"
      onSubmit={(event) => void onPublish(event)}
      className="grid items-start gap-6 lg:grid-cols-[minmax(0,1fr)_minmax(0,24rem)]"
    >
      <div className="flex flex-col gap-6">
        <Card className="flex flex-col gap-4">
          <h2 className="text-lg font-semibold">Test pieces</h2>
          {pieces.fields.length === 0 ? <p className="text-sm text-muted">No pieces yet: pick them from the library below.</p> : null}
          <ul className="flex flex-col gap-3">
            {pieces.fields.map((row, index) => {
              const fromLibrary = libraryById.get(row.libraryPieceId);
              const path = `pieces.${index}.filamentGrams`;
              return (
                <li key={row.id} className="flex flex-wrap items-end gap-3 rounded-lg border border-line p-3">
                  <div className="min-w-[12rem] flex-1">
                    <p className="font-medium">{fromLibrary?.name ?? "Unknown piece"}</p>
                    <p className="text-xs text-muted">
                      Library: {fromLibrary?.filamentGrams ?? "?"} g in PLA at reference scale
                      {material !== "PLA" && fromLibrary ? ` → ${libraryGramsIn(material, fromLibrary.filamentGrams)} g in ${material}` : ""}
                    </p>
                    {errorText(`pieces.${index}.libraryPieceId`)}
                  </div>
                  <div className="flex w-40 flex-col gap-1">
                    <label htmlFor={id(path)} className="text-xs font-medium">
                      Filament per print (g)
                    </label>
                    <input
                      {...field(path)}
                      inputMode="decimal"
                      step="0.1"
                      className={numberClass}
                      {...register(`pieces.${index}.filamentGrams`, {
                        valueAsNumber: true,
                        onChange: () => setValue(`pieces.${index}.followsLibrary`, false),
                      })}
                    />
                    {errorText(path)}
                  </div>
                  <Button type="button" size="sm" variant="quiet" onClick={() => pieces.remove(index)} aria-label={`Remove ${fromLibrary?.name ?? "piece"}`}>
                    <Icon node={Trash2} className="h-3.5 w-3.5" /> Remove
                  </Button>
                </li>
              );
            })}
          </ul>
          <div className="flex flex-wrap items-end gap-2">
            <div className="flex min-w-[16rem] flex-1 flex-col gap-1">
              <label htmlFor={id("pick")} className="text-sm font-medium">
                Add a piece from the library
              </label>
              <select id={id("pick")} value={pick} onChange={(event) => setPick(event.target.value)} className={inputClass}>
                <option value="">Choose a piece…</option>
                {available.map((piece) => (
                  <option key={piece.id} value={piece.id}>
                    {piece.name} ({piece.filamentGrams} g)
                  </option>
                ))}
              </select>
            </div>
            <Button type="button" variant="secondary" onClick={addPiece} disabled={!pick || pieces.fields.length >= PLAN_MAX_PIECES}>
              <Icon node={Plus} /> Add piece
            </Button>
          </div>
          {piecesError ? <p className="text-xs font-medium text-rose">{piecesError}</p> : null}
        </Card>

        <Card className="flex flex-col gap-4">
          <div>
            <h2 className="text-lg font-semibold">Variants</h2>
            <p className="text-sm text-muted">The first is the reference every score is measured against; the others are the parts under test.</p>
          </div>
          <ol className="flex flex-col gap-3">
            {variants.fields.map((row, index) => {
              const path = `variants.${index}.name`;
              return (
                <li key={row.id} className="flex flex-wrap items-end gap-3">
                  <div className="flex min-w-[14rem] flex-1 flex-col gap-1">
                    <label htmlFor={id(path)} className="text-xs font-medium">
                      {index === 0 ? "Reference variant" : `Variant under test ${index}`}
                    </label>
                    <input {...field(path)} className={inputClass} placeholder={index === 0 ? undefined : "e.g. Ring duct, 45° outlets"} {...register(`variants.${index}.name`)} />
                    {errorText(path)}
                  </div>
                  {index === 0 ? (
                    <span className="mb-2 rounded bg-slate-soft px-1.5 text-xs text-muted">reference</span>
                  ) : (
                    <Button type="button" size="sm" variant="quiet" onClick={() => variants.remove(index)} aria-label={`Remove variant ${index}`}>
                      <Icon node={Trash2} className="h-3.5 w-3.5" /> Remove
                    </Button>
                  )}
                </li>
              );
            })}
          </ol>
          <div>
            <Button type="button" variant="secondary" size="sm" onClick={() => variants.append({ name: "" })} disabled={variants.fields.length >= PLAN_MAX_VARIANTS}>
              <Icon node={Plus} className="h-3.5 w-3.5" /> Add a variant under test
            </Button>
          </div>
          {variantsError ? <p className="text-xs font-medium text-rose">{variantsError}</p> : null}
        </Card>

        <Card className="flex flex-col gap-4">
          <h2 className="text-lg font-semibold">Protocol</h2>
          <div className="grid gap-4 sm:grid-cols-2">
            <div className="flex flex-col gap-1">
              <label htmlFor={id("printerId")} className="text-sm font-medium">Printer</label>
              <select {...field("printerId")} className={inputClass} {...register("printerId", { onChange: (event: React.ChangeEvent<HTMLSelectElement>) => changePrinter(event.target.value) })}>
                {printers.map((option) => (
                  <option key={option.id} value={option.id}>
                    {option.name}
                    {option.status !== "available" ? ` (${option.status})` : ""}
                  </option>
                ))}
              </select>
              {printer ? (
                <p className="text-xs text-muted">
                  {printer.model} · up to {printer.maxFlowMm3PerS} mm³/s · prints {printer.materials.join(", ")}
                </p>
              ) : null}
              {errorText("printerId")}
            </div>
            <div className="flex flex-col gap-1">
              <label htmlFor={id("material")} className="text-sm font-medium">Material</label>
              <select
                {...field("material")}
                className={inputClass}
                {...register("material", { onChange: (event: React.ChangeEvent<HTMLSelectElement>) => changeMaterial(event.target.value as MaterialId) })}
              >
                {materials.map((option) => (
                  <option key={option.id} value={option.id}>
                    {option.id} — {option.name}
                  </option>
                ))}
              </select>
              {errorText("material")}
            </div>
            <NumberField label="Layer height" suffix="mm" path="layerHeightMm" step="0.01" field={field} errorText={errorText} register={register} />
            <NumberField
              label="Maximum volumetric flow"
              suffix="mm³/s"
              path="maxFlowMm3PerS"
              step="0.5"
              field={field}
              errorText={errorText}
              register={register}
              onInput={() => setFlowEdited(true)}
              hint={printer && (maxFlow ?? 0) > printer.maxFlowMm3PerS ? `Capped at the printer's ${printer.maxFlowMm3PerS} mm³/s.` : undefined}
            />
            <NumberField label="Part-cooling fan" suffix="%" path="fanPercent" step="5" field={field} errorText={errorText} register={register} />
            <NumberField label="Repeats of each piece × variant" suffix="×" path="repeats" step="1" field={field} errorText={errorText} register={register} />
          </div>
          {cautions.length > 0 ? (
            <ul className="flex flex-col gap-2">
              {cautions.map((caution) => (
                <li key={caution.id} className="flex gap-2 rounded-lg border border-ember/30 bg-ember-soft/50 p-2 text-xs">
                  <Icon node={AlertTriangle} className="mt-0.5 h-3.5 w-3.5 text-ember" />
                  <span>
                    <strong className="text-ember">{caution.title}.</strong> {caution.text}
                  </span>
                </li>
              ))}
            </ul>
          ) : null}
        </Card>

        <Card className="flex flex-col gap-4">
          <h2 className="text-lg font-semibold">Campaign</h2>
          <div className="flex flex-col gap-1">
            <label htmlFor={id("title")} className="text-sm font-medium">Title</label>
            <input {...field("title")} className={inputClass} {...register("title")} />
            {errorText("title")}
          </div>
          <div className="flex flex-col gap-1">
            <label htmlFor={id("summary")} className="text-sm font-medium">Summary for backers</label>
            <textarea {...field("summary")} rows={3} className={inputClass} {...register("summary")} />
            {errorText("summary")}
          </div>
          <div className="flex flex-col gap-1 sm:w-64">
            <label htmlFor={id("deadline")} className="text-sm font-medium">Deadline</label>
            <input {...field("deadline")} type="date" min={dates.earliest} max={dates.latest} className={inputClass} {...register("deadline")} />
            <p className="text-xs text-muted">
              Pledges close at the end of this day, lab time ({timeZone}): {DEADLINE_MIN_DAYS} to {DEADLINE_MAX_DAYS} days ahead, {dates.earliest} to{" "}
              {dates.latest}.
            </p>
            {errorText("deadline")}
          </div>
          <div className="flex flex-col gap-3 rounded-lg bg-paper p-3">
            <p className="text-sm">
              Goal:{" "}
              <strong className="font-mono" data-testid="plan-computed-goal">
                {computedGoal !== undefined ? formatMoney(computedGoal, currency) : "—"}
              </strong>{" "}
              <span className="text-muted">computed from the plan at today&apos;s rates</span>
            </p>
            <label className="inline-flex items-center gap-2 text-sm">
              <input type="checkbox" className="h-4 w-4 accent-teal" {...register("overrideGoal")} /> Set the goal by hand
            </label>
            {overrideGoal ? (
              <div className="grid gap-3 sm:grid-cols-[10rem_minmax(0,1fr)]">
                <div className="flex flex-col gap-1">
                  <label htmlFor={id("goalOverride")} className="text-sm font-medium">Goal ({currency})</label>
                  <input {...field("goalOverride")} inputMode="decimal" className={numberClass} {...register("goalOverride")} />
                  {errorText("goalOverride")}
                </div>
                <div className="flex flex-col gap-1">
                  <label htmlFor={id("goalOverrideReason")} className="text-sm font-medium">Reason for backers</label>
                  <textarea {...field("goalOverrideReason")} rows={2} className={inputClass} {...register("goalOverrideReason")} />
                  <p className="text-xs text-muted">Shown on the campaign page beside the goal.</p>
                  {errorText("goalOverrideReason")}
                </div>
              </div>
            ) : null}
          </div>
        </Card>

        <div className="flex flex-col gap-2">
          {banner ? (
            <p role="alert" className="text-sm font-medium text-rose">
              {banner}
            </p>
          ) : null}
          <div className="flex flex-wrap items-center gap-3">
            <Button type="submit" disabled={isSubmitting || isSubmitSuccessful}>
              {isSubmitting || isSubmitSuccessful ? "Publishing…" : "Publish the campaign"}
            </Button>
            <p className="text-xs text-muted">
              Opens “{proposal.title}” for pledges at once, goal-or-refund: if the goal is not met by the deadline every pledge is refunded.
            </p>
          </div>
        </div>
      </div>

      <div className="flex flex-col gap-4 lg:sticky lg:top-6">
        <PlanEstimatePanel summary={estimate.data} phase={estimatePhase} message={estimateMessage} counts={counts} />
      </div>
    </form>
  );
}

function NumberField({
  label,
  suffix,
  path,
  step,
  hint,
  field,
  errorText,
  register,
  onInput,
}: {
  label: string;
  suffix: string;
  path: "layerHeightMm" | "maxFlowMm3PerS" | "fanPercent" | "repeats";
  step: string;
  hint?: string;
  field: (path: string) => { id: string; "aria-invalid"?: true; "aria-describedby"?: string };
  errorText: (path: string) => React.ReactNode;
  register: ReturnType<typeof useForm<FormValues, unknown, PublishTestPlanInput>>["register"];
  onInput?: () => void;
}) {
  const props = field(path);
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={props.id} className="text-sm font-medium">{label}</label>
      <div className="flex items-center gap-2">
        <input {...props} type="number" step={step} inputMode="decimal" className={numberClass} onInput={onInput} {...register(path, { valueAsNumber: true })} />
        <span className="shrink-0 text-xs text-muted">{suffix}</span>
      </div>
      {hint ? <p className="text-xs text-muted">{hint}</p> : null}
      {errorText(path)}
    </div>
  );
}
