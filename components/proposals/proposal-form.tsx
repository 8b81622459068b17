"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useDeferredValue, useEffect, useRef, useState, useTransition } from "react";
import { get, useForm, useWatch, type FieldErrors, type Path, type Resolver } from "react-hook-form";
import { Field, inputClass } from "@/components/estimate/field";
import { Button } from "@/components/ui/button";
import type { ProposalState } from "@/db/schema";
import { MATERIAL_IDS, getMaterial } from "@/lib/estimate/materials";
import { needsSafetyNote } from "@/lib/proposals/rules";
import { materialCautions } from "@/lib/safety";
import {
  printerTypeLabels,
  printerTypeValues,
  proposalDraftSchema,
  proposalKindLabels,
  proposalKindValues,
  proposalSubmissionSchema,
} from "@/lib/validation/proposal";
import type { ActionResult } from "@/server/action";
import { CautionList } from "./caution-list";
import { DuctFields } from "./duct-fields";
import { toProposalInput, type ProposalFormValues, type ProposalPayload, type UploadItem } from "./form-values";
import { Markdown } from "./markdown";
import { UploadField } from "./upload-field";

type Intent = "draft" | "submit";
type Saved = { id: string; slug: string; state: ProposalState };
type SaveAction = (proposalId: string | null, values: unknown) => Promise<ActionResult<Saved>>;

// An empty number input reaches the schema as NaN; where the schema names no message, say it plainly.
const parseOptions = {
  error: (issue: { code?: string; expected?: unknown }) =>
    issue.code === "invalid_type" && issue.expected === "number" ? "Enter a number." : undefined,
};
const draftResolver = zodResolver(proposalDraftSchema, parseOptions);
const submissionResolver = zodResolver(proposalSubmissionSchema, parseOptions);

const message = (errors: FieldErrors<ProposalFormValues>, path: string): string | undefined => {
  const error: unknown = get(errors, path);
  return error && typeof error === "object" && "message" in error && typeof error.message === "string" ? error.message : undefined;
};

/**
 * The proposal form. "Save draft" checks the draft schema, "Submit to the lab" the submission
 * schema — the same zod schemas the server actions check again. Errors from either side land
 * beside their fields; nothing typed is cleared.
 */
export function ProposalForm({
  proposal,
  initialValues,
  initialUploads,
  justSaved,
  saveDraft,
  submit,
}: {
  proposal: { id: string; slug: string; state: ProposalState } | null;
  initialValues: ProposalFormValues;
  initialUploads: UploadItem[];
  justSaved: boolean;
  saveDraft: SaveAction;
  submit: SaveAction;
}) {
  const router = useRouter();
  const intent = useRef<Intent>("draft");
  const [uploads, setUploads] = useState<UploadItem[]>(initialUploads);
  // The resolver runs outside render (on submit and re-validation); it reads the finished uploads from here.
  const uploadIds = useRef<string[]>([]);
  useEffect(() => {
    uploadIds.current = uploads.flatMap((item) => (item.status === "done" && item.upload ? [item.upload.id] : []));
  }, [uploads]);
  const [lastIntent, setLastIntent] = useState<Intent>("draft");
  const [banner, setBanner] = useState<{ tone: "error" | "ok"; text: string } | null>(null);
  // After the first save of a new draft the page reloads as its edit page: say so at the top.
  const [arrivedSaved, setArrivedSaved] = useState(justSaved);
  const [pending, startTransition] = useTransition();
  const isDraft = proposal === null || proposal.state === "draft";

  // One form, two schemas: the button pressed picks which one the resolver applies.
  const resolver: Resolver<ProposalFormValues, unknown, ProposalPayload> = (values, context, options) => {
    const input = toProposalInput(values, uploadIds.current) as never;
    const chosen = intent.current === "submit" || !isDraft ? submissionResolver : draftResolver;
    return chosen(input, context, options as never) as ReturnType<Resolver<ProposalFormValues, unknown, ProposalPayload>>;
  };

  const {
    register,
    control,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<ProposalFormValues, unknown, ProposalPayload>({ defaultValues: initialValues, resolver, mode: "onSubmit", reValidateMode: "onChange" });

  const kind = useWatch({ control, name: "kind" });
  const material = useWatch({ control, name: "material" });
  const description = useDeferredValue(useWatch({ control, name: "descriptionMd" }));
  const busy = uploads.some((item) => item.status === "uploading" || item.status === "processing");

  function save(chosen: Intent) {
    intent.current = chosen;
    setLastIntent(chosen);
    setBanner(null);
    setArrivedSaved(false);
    void handleSubmit(
      (payload) =>
        new Promise<void>((resolve) => {
          startTransition(async () => {
            const action = chosen === "submit" ? submit : saveDraft;
            let result: ActionResult<Saved>;
            try {
              result = await action(proposal?.id ?? null, payload);
            } catch {
              setBanner({ tone: "error", text: "We could not save just now; everything you typed is still here. Try again in a moment." });
              resolve();
              return;
            }
            if (!result.ok) {
              const unplaced: string[] = [];
              for (const [field, text] of Object.entries(result.fields ?? {})) {
                const placeable = (field in initialValues && field !== "ductDetails") || field.startsWith("ductDetails.");
                if (placeable) setError(field as Path<ProposalFormValues>, { type: "server", message: text });
                else unplaced.push(text);
              }
              setBanner({ tone: "error", text: unplaced.length > 0 ? unplaced.join(" ") : result.message });
            } else if (chosen === "submit") {
              router.push(`/proposals/${result.data.slug}`);
            } else if (proposal === null) {
              router.replace(`/proposals/${result.data.slug}/edit?saved=draft`);
            } else {
              setBanner({
                tone: "ok",
                text: isDraft ? "Draft saved. Only you can see it until you submit it to the lab." : "Changes saved.",
              });
            }
            resolve();
          });
        }),
      // react-hook-form moves focus to the first marked field itself.
      () => setBanner({ tone: "error", text: "Some fields need attention; they are marked above." }),
    )();
  }

  const cautions = kind === "material" && material ? materialCautions(material) : [];
  const working = pending || busy;
  return (
    <form
      noValidate
      className="flex flex-col gap-6"
      onSubmit={(event) => {
        event.preventDefault();
        save(isDraft ? "draft" : "submit");
      }}
    >
      {arrivedSaved ? (
        <p role="status" className="rounded-md bg-moss-soft p-3 text-sm text-moss">
          Draft saved. Only you can see it until you submit it to the lab.
        </p>
      ) : null}
      <div className="grid gap-4 sm:grid-cols-2">
        <Field id="proposal-title" label="Title" error={message(errors, "title")} className="sm:col-span-2" hint="What to test, in a line.">
          {(controlProps) => <input {...controlProps} {...register("title")} className={inputClass} maxLength={120} autoComplete="off" />}
        </Field>
        <Field id="proposal-kind" label="Kind of test" error={message(errors, "kind")}>
          {(controlProps) => (
            <select {...controlProps} {...register("kind")} className={inputClass}>
              <option value="" disabled>
                Choose…
              </option>
              {proposalKindValues.map((value) => (
                <option key={value} value={value}>
                  {proposalKindLabels[value]}
                </option>
              ))}
            </select>
          )}
        </Field>
        <Field id="proposal-printer" label="Target printer type" error={message(errors, "printerType")}>
          {(controlProps) => (
            <select {...controlProps} {...register("printerType")} className={inputClass}>
              <option value="" disabled>
                Choose…
              </option>
              {printerTypeValues.map((value) => (
                <option key={value} value={value}>
                  {printerTypeLabels[value]}
                </option>
              ))}
            </select>
          )}
        </Field>
        <Field
          id="proposal-why"
          label="Why it matters"
          error={message(errors, "why")}
          className="sm:col-span-2"
          hint="A sentence or two (at least 20 characters to submit): what would the test settle?"
        >
          {(controlProps) => <textarea {...controlProps} {...register("why")} rows={3} maxLength={2000} className={inputClass} />}
        </Field>
      </div>

      {kind === "material" ? (
        <div className="flex flex-col gap-4 rounded-lg border border-line p-4">
          <Field id="proposal-material" label="Material" error={message(errors, "material")} className="sm:max-w-xs" hint="The material the test heats.">
            {(controlProps) => (
              <select {...controlProps} {...register("material")} className={inputClass}>
                <option value="">Choose…</option>
                {MATERIAL_IDS.map((id) => (
                  <option key={id} value={id}>
                    {id} — {getMaterial(id).name}
                  </option>
                ))}
              </select>
            )}
          </Field>
          {cautions.length > 0 ? (
            <div aria-live="polite" className="flex flex-col gap-2">
              <CautionList cautions={cautions} headingId="form-cautions-heading" heading={`Safety with ${material}`} level={3} />
              {needsSafetyNote("material", material || null) ? (
                <p className="text-sm text-muted">The lab writes down its precautions for {material} before it accepts the test.</p>
              ) : null}
            </div>
          ) : null}
        </div>
      ) : null}

      {kind === "duct" ? <DuctFields control={control} register={register} errors={errors} /> : null}

      <div className="grid gap-4 lg:grid-cols-2">
        <Field
          id="proposal-description"
          label="Description"
          error={message(errors, "descriptionMd")}
          hint="Markdown: ## headings, **bold**, lists, tables, links. HTML is not shown."
        >
          {(controlProps) => (
            <textarea {...controlProps} {...register("descriptionMd")} rows={14} maxLength={20000} className={`${inputClass} font-mono`} />
          )}
        </Field>
        <div className="flex min-w-0 flex-col gap-1">
          <p className="text-sm font-medium" id="proposal-preview-label">
            Preview
          </p>
          <div
            className="min-h-40 flex-1 overflow-auto rounded-lg border border-dashed border-line bg-surface px-4 py-2 lg:max-h-[26rem]"
            aria-labelledby="proposal-preview-label"
            role="region"
          >
            {description.trim() ? <Markdown>{description}</Markdown> : <p className="py-2 text-sm text-muted">The description appears here as readers will see it.</p>}
          </div>
        </div>
      </div>

      <UploadField items={uploads} onChange={setUploads} proposalId={proposal?.id ?? null} error={message(errors, "uploadIds")} />

      {banner ? (
        <p
          role={banner.tone === "error" ? "alert" : "status"}
          className={banner.tone === "error" ? "rounded-md bg-rose-soft p-3 text-sm text-rose" : "rounded-md bg-moss-soft p-3 text-sm text-moss"}
        >
          {banner.text}
        </p>
      ) : null}

      <div className="flex flex-wrap items-center gap-3 border-t border-line pt-4">
        {isDraft ? (
          <>
            <Button type="button" variant="secondary" disabled={working} onClick={() => save("draft")}>
              {pending && lastIntent === "draft" ? "Saving…" : "Save draft"}
            </Button>
            <Button type="button" disabled={working} onClick={() => save("submit")}>
              {pending && lastIntent === "submit" ? "Submitting…" : "Submit to the lab"}
            </Button>
          </>
        ) : (
          <Button type="button" disabled={working} onClick={() => save("submit")}>
            {pending ? "Saving…" : "Save changes"}
          </Button>
        )}
        {busy ? <span className="text-sm text-muted">Waiting for the uploads to finish…</span> : null}
        {proposal ? (
          <Link href={`/proposals/${proposal.slug}`} className="text-sm font-medium text-teal underline">
            View the proposal
          </Link>
        ) : null}
      </div>
      <p className="text-xs text-muted">
        Once submitted, Filament Club members can vote on it. You can keep editing until the lab starts reviewing it.
      </p>
    </form>
  );
}
