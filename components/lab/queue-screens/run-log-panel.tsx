"use client";

import { useId, useState, useTransition } from "react";
import { useRouter } from "next/navigation";
import { Play } from "lucide";
import { finishRunAction, startRunAction } from "@/app/lab/jobs/actions";
import { Field, inputClass } from "@/components/estimate/field";
import { Button } from "@/components/ui/button";
import { Icon } from "@/components/ui/icon";
import { finishRunSchema } from "@/lib/validation/run-log";
import { formNumber, formText, useActionForm } from "./action-form";
import { FormMessage, TextInput } from "./form-bits";

export function StartRunButton({ jobId, disabledReason }: { jobId: string; disabledReason: string | null }) {
  const router = useRouter();
  const [pending, startTransition] = useTransition();
  const [error, setError] = useState<string | null>(null);
  return (
    <div className="flex flex-col gap-2">
      <div>
        <Button
          disabled={pending || disabledReason !== null}
          onClick={() =>
            startTransition(async () => {
              const result = await startRunAction({ jobId });
              setError(result.ok ? null : result.message);
              router.refresh();
            })
          }
        >
          <Icon node={Play} /> {pending ? "Starting…" : "Start this job"}
        </Button>
      </div>
      {disabledReason ? <p className="text-sm text-muted">{disabledReason}</p> : null}
      {error ? <p role="alert" className="text-sm font-medium text-rose">{error}</p> : null}
    </div>
  );
}

/** The finish form for the job's open run; a retried submit logs nothing new. */
export function FinishRunForm({ runId, suggestedHours, suggestedGrams }: { runId: string; suggestedHours: number; suggestedGrams: number }) {
  const uid = useId();
  const [outcome, setOutcome] = useState<"done" | "failed">("done");
  const { errors, pending, submit } = useActionForm({ schema: finishRunSchema });

  function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    submit(
      {
        runId,
        actualHours: formNumber(form, "actualHours"),
        filamentUsedGrams: formNumber(form, "filamentUsedGrams"),
        outcome,
        failureReason: outcome === "failed" ? formText(form, "failureReason") : undefined,
        notes: formText(form, "notes"),
      },
      finishRunAction,
    );
  }

  return (
    <form noValidate onSubmit={onSubmit} aria-label="Finish this run" className="flex flex-col gap-4">
      <fieldset className="flex flex-col gap-1">
        <legend className="text-sm font-medium">Outcome</legend>
        <div className="flex gap-4">
          <label className="inline-flex items-center gap-1.5 text-sm">
            <input type="radio" name="outcome" value="done" checked={outcome === "done"} onChange={() => setOutcome("done")} /> Done — the print is good
          </label>
          <label className="inline-flex items-center gap-1.5 text-sm">
            <input type="radio" name="outcome" value="failed" checked={outcome === "failed"} onChange={() => setOutcome("failed")} /> Failed — print it again
          </label>
        </div>
      </fieldset>
      <div className="grid gap-3 sm:grid-cols-2">
        <TextInput id={`${uid}-hours`} name="actualHours" label="Actual hours" numeric errors={errors} defaultValue={suggestedHours} hint="From start to the print coming off the bed." />
        <TextInput id={`${uid}-grams`} name="filamentUsedGrams" label="Filament used (g)" numeric errors={errors} defaultValue={suggestedGrams} hint="Weigh the print with supports and purge." />
      </div>
      {outcome === "failed" ? (
        <TextInput id={`${uid}-reason`} name="failureReason" label="What went wrong" errors={errors} hint="e.g. detached from the bed at layer 40. The job goes back into the queue." />
      ) : null}
      <Field id={`${uid}-notes`} label="Notes (optional)" error={errors.fields.notes}>
        {(control) => <textarea {...control} name="notes" rows={3} className={inputClass} />}
      </Field>
      <FormMessage errors={errors} />
      <div>
        <Button type="submit" disabled={pending}>
          {pending ? "Logging…" : "Log this run"}
        </Button>
      </div>
    </form>
  );
}
