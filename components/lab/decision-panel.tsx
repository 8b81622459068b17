"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useQuery, useQueryClient } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useEffect, useId, useMemo, useState } from "react";
import { useForm, useWatch, type FieldValues, type Path, type UseFormSetError } from "react-hook-form";
import { Check, GitMerge, Search, X } from "lucide";
import type { z } from "zod";
import { acceptProposalAction, declineProposalAction, mergeProposalAction } from "@/app/lab/proposals/actions";
import { ProposalStateBadge } from "@/components/proposal-state-badge";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Icon } from "@/components/ui/icon";
import type { TriagePage } from "@/db/queries/triage";
import { cn } from "@/lib/cn";
import { acceptSchema, declineSchema, mergeSchema, proposalKindLabels } from "@/lib/validation/proposal";
import { triageQueryToSearchParams, triageStateValues } from "@/lib/validation/triage";
import type { ActionResult } from "@/server/action";
import { labFetch } from "./api";

type Props = {
  proposal: { id: string; title: string };
  /** required: the lab refuses to accept without a note; suggested: the material calls for one. */
  safety: { required: boolean; suggested: boolean; why: string | null };
};

const textareaClass =
  "w-full rounded-lg border border-line bg-surface px-3 py-2 text-sm aria-invalid:border-rose aria-invalid:bg-rose-soft/30";

/** Puts a failed action's message beside its field, or on `fallback` when the server named none. */
function showFailure<T extends FieldValues>(result: ActionResult<unknown>, setError: UseFormSetError<T>, fields: readonly Path<T>[], fallback: Path<T> | "root") {
  if (result.ok) return;
  let placed = false;
  for (const field of fields) {
    const message = result.fields?.[field];
    if (message) {
      setError(field, { type: "server", message });
      placed = true;
    }
  }
  if (!placed) setError(fallback, { type: "server", message: result.message });
}

function ErrorText({ id, message }: { id: string; message?: string }) {
  return message ? (
    <p id={id} className="text-xs font-medium text-rose">
      {message}
    </p>
  ) : null;
}

export function DecisionPanel({ proposal, safety }: Props) {
  return (
    <div className="flex flex-col gap-4">
      <AcceptForm proposalId={proposal.id} safety={safety} />
      <DeclineForm proposalId={proposal.id} />
      <MergeForm proposalId={proposal.id} />
    </div>
  );
}

function AcceptForm({ proposalId, safety }: { proposalId: string; safety: Props["safety"] }) {
  const uid = useId();
  const router = useRouter();
  const queryClient = useQueryClient();
  const schema = useMemo(
    () =>
      acceptSchema.superRefine((value, context) => {
        if (safety.required && !value.safetyNote) {
          context.addIssue({ code: "custom", path: ["safetyNote"], message: "Write the safety note before accepting: the lab requires one for this material." });
        }
      }),
    [safety.required],
  );
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting, isSubmitSuccessful },
  } = useForm<z.input<typeof acceptSchema>>({ resolver: zodResolver(schema), defaultValues: { safetyNote: "" } });

  const onSubmit = handleSubmit(async (values) => {
    const result = await acceptProposalAction(proposalId, values);
    if (!result.ok) return showFailure(result, setError, ["safetyNote"], "root");
    void queryClient.invalidateQueries({ queryKey: ["lab-triage"] });
    router.push(`/lab/proposals/${proposalId}/plan`);
  });

  const error = errors.safetyNote?.message;
  return (
    <Card className="flex flex-col gap-3">
      <h2 className="flex items-center gap-2 text-lg font-semibold">
        <Icon node={Check} className="h-5 w-5 text-moss" /> Accept
      </h2>
      <form noValidate onSubmit={(event) => void onSubmit(event)} className="flex flex-col gap-3" aria-label="Accept">
        <div className="flex flex-col gap-1">
          <label htmlFor={`${uid}-note`} className="text-sm font-medium">
            Safety note{safety.required ? " (required)" : " (optional)"}
          </label>
          <textarea
            id={`${uid}-note`}
            rows={3}
            className={textareaClass}
            aria-invalid={error ? true : undefined}
            aria-describedby={[error ? `${uid}-note-error` : "", `${uid}-note-hint`].filter(Boolean).join(" ")}
            {...register("safetyNote")}
          />
          <p id={`${uid}-note-hint`} className={cn("text-xs", safety.suggested ? "text-ember" : "text-muted")}>
            {safety.suggested && safety.why
              ? `${safety.required ? "Required" : "Recommended"}: ${safety.why}`
              : "Precautions backers and the lab should know about; shown with the campaign's safety cautions."}
          </p>
          <ErrorText id={`${uid}-note-error`} message={error} />
        </div>
        <ErrorText id={`${uid}-accept-error`} message={errors.root?.message} />
        <div>
          <Button type="submit" disabled={isSubmitting || isSubmitSuccessful}>
            {isSubmitting ? "Accepting…" : "Accept and plan the test"}
          </Button>
        </div>
        <p className="text-xs text-muted">The proposer is e-mailed that the lab accepted it. Next: the test plan, which opens the campaign.</p>
      </form>
    </Card>
  );
}

function DeclineForm({ proposalId }: { proposalId: string }) {
  const uid = useId();
  const router = useRouter();
  const queryClient = useQueryClient();
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<z.input<typeof declineSchema>>({ resolver: zodResolver(declineSchema), defaultValues: { reason: "" } });

  const onSubmit = handleSubmit(async (values) => {
    const result = await declineProposalAction(proposalId, values);
    if (!result.ok) return showFailure(result, setError, ["reason"], "root");
    void queryClient.invalidateQueries({ queryKey: ["lab-triage"] });
    router.refresh();
  });

  const error = errors.reason?.message;
  return (
    <Card className="flex flex-col gap-3">
      <h2 className="flex items-center gap-2 text-lg font-semibold">
        <Icon node={X} className="h-5 w-5 text-rose" /> Decline
      </h2>
      <form noValidate onSubmit={(event) => void onSubmit(event)} className="flex flex-col gap-3" aria-label="Decline">
        <div className="flex flex-col gap-1">
          <label htmlFor={`${uid}-reason`} className="text-sm font-medium">
            Reason for declining
          </label>
          <textarea
            id={`${uid}-reason`}
            rows={4}
            className={textareaClass}
            aria-invalid={error ? true : undefined}
            aria-describedby={[error ? `${uid}-reason-error` : "", `${uid}-reason-hint`].filter(Boolean).join(" ")}
            {...register("reason")}
          />
          <p id={`${uid}-reason-hint`} className="text-xs text-muted">
            The proposer is e-mailed this reason.
          </p>
          <ErrorText id={`${uid}-reason-error`} message={error} />
        </div>
        <ErrorText id={`${uid}-decline-error`} message={errors.root?.message} />
        <div>
          <Button type="submit" variant="danger" disabled={isSubmitting}>
            {isSubmitting ? "Declining…" : "Decline and e-mail the reason"}
          </Button>
        </div>
      </form>
    </Card>
  );
}

const MERGE_SEARCH_DEBOUNCE_MS = 300;

function MergeForm({ proposalId }: { proposalId: string }) {
  const uid = useId();
  const router = useRouter();
  const queryClient = useQueryClient();
  const [text, setText] = useState("");
  const [search, setSearch] = useState("");
  useEffect(() => {
    const timer = setTimeout(() => setSearch(text.trim()), MERGE_SEARCH_DEBOUNCE_MS);
    return () => clearTimeout(timer);
  }, [text]);

  // Every decided state is listed too, so the server's reason for refusing a closed target is seen, not guessed.
  const params = triageQueryToSearchParams({ state: [...triageStateValues], q: search || undefined, sort: "votes", dir: "desc", pageSize: 8 }).toString();
  const candidates = useQuery({
    queryKey: ["lab-triage", params],
    queryFn: ({ signal }) => labFetch<TriagePage>(`/api/lab/proposals?${params}`, { signal }),
  });
  const options = (candidates.data?.rows ?? []).filter((row) => row.id !== proposalId);

  const {
    register,
    handleSubmit,
    setError,
    clearErrors,
    control,
    formState: { errors, isSubmitting },
  } = useForm<z.input<typeof mergeSchema>>({ resolver: zodResolver(mergeSchema), defaultValues: { targetId: "" } });
  const targetId = useWatch({ control, name: "targetId" });

  const onSubmit = handleSubmit(async (values) => {
    const result = await mergeProposalAction(proposalId, values);
    if (!result.ok) return showFailure(result, setError, ["targetId"], "targetId");
    void queryClient.invalidateQueries({ queryKey: ["lab-triage"] });
    router.refresh();
  });

  const error = errors.targetId?.message;
  return (
    <Card className="flex flex-col gap-3">
      <h2 className="flex items-center gap-2 text-lg font-semibold">
        <Icon node={GitMerge} className="h-5 w-5 text-plum" /> Merge into…
      </h2>
      <form noValidate onSubmit={(event) => void onSubmit(event)} className="flex flex-col gap-3" aria-label="Merge">
        <div className="flex flex-col gap-1">
          <label htmlFor={`${uid}-search`} className="text-sm font-medium">
            Find the proposal this duplicates
          </label>
          <div className="relative">
            <Icon node={Search} className="pointer-events-none absolute left-3 top-1/2 -translate-y-1/2 text-muted" />
            <input
              id={`${uid}-search`}
              type="search"
              value={text}
              onChange={(event) => setText(event.target.value)}
              placeholder="Search titles and descriptions"
              className="w-full rounded-lg border border-line bg-surface py-2 pl-9 pr-3 text-sm"
            />
          </div>
        </div>
        <fieldset
          className="flex max-h-72 flex-col gap-1 overflow-y-auto"
          aria-invalid={error ? true : undefined}
          aria-describedby={error ? `${uid}-target-error` : undefined}
          aria-busy={candidates.isFetching}
        >
          <legend className="sr-only">Proposal to merge into</legend>
          {candidates.isError ? <p className="text-xs text-rose">Could not search: {candidates.error.message}</p> : null}
          {!candidates.isPending && options.length === 0 ? <p className="text-xs text-muted">No other proposal matches.</p> : null}
          {options.map((option) => (
            <label
              key={option.id}
              className={cn(
                "flex cursor-pointer items-start gap-2 rounded-lg border border-line p-2 text-sm hover:border-teal",
                targetId === option.id && "border-teal bg-teal-soft/40",
              )}
            >
              <input
                type="radio"
                value={option.id}
                className="mt-1 accent-teal"
                {...register("targetId", { onChange: () => clearErrors("targetId") })}
              />
              <span className="flex min-w-0 flex-col gap-0.5">
                <span className="font-medium">{option.title}</span>
                <span className="flex flex-wrap items-center gap-1.5 text-xs text-muted">
                  <ProposalStateBadge state={option.state} /> {proposalKindLabels[option.kind]} · {option.voteCount} votes
                </span>
              </span>
            </label>
          ))}
        </fieldset>
        <ErrorText id={`${uid}-target-error`} message={error} />
        <div>
          <Button type="submit" variant="secondary" disabled={isSubmitting}>
            {isSubmitting ? "Merging…" : "Merge into the selected proposal"}
          </Button>
        </div>
        <p className="text-xs text-muted">Votes and followers move to the proposal you pick; the proposer is e-mailed where it went.</p>
      </form>
    </Card>
  );
}
