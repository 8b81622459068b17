"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useId, useState } from "react";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { withdrawCampaignAction } from "@/app/lab/campaigns/[id]/actions";
import { Button } from "@/components/ui/button";
import { withdrawCampaignSchema } from "@/lib/validation/campaign-close";

type Props = { campaignId: string; paidPledges: number };

/** The host's withdraw control: a required reason (quoted in every backer's refund mail), then the server action. */
export function WithdrawCampaignForm({ campaignId, paidPledges }: Props) {
  const uid = useId();
  const router = useRouter();
  const [done, setDone] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting, isSubmitSuccessful },
  } = useForm<z.input<typeof withdrawCampaignSchema>>({ resolver: zodResolver(withdrawCampaignSchema), defaultValues: { reason: "" } });

  const onSubmit = handleSubmit(async (values) => {
    const result = await withdrawCampaignAction(campaignId, values);
    if (!result.ok) {
      setError(result.fields?.reason ? "reason" : "root", { type: "server", message: result.fields?.reason ?? result.message });
      return;
    }
    const { refunded, waiting, flagged } = result.data;
    setDone(
      `Withdrawn. ${refunded} refund${refunded === 1 ? "" : "s"} made` +
        (waiting ? `, ${waiting} waiting for the processor (the sweeper retries)` : "") +
        (flagged ? `, ${flagged} need a look (listed on this page)` : "") +
        ".",
    );
    router.refresh();
  });

  const error = errors.reason?.message;
  return (
    <form noValidate onSubmit={(event) => void onSubmit(event)} className="flex flex-col gap-3" aria-label="Withdraw this campaign">
      <div className="flex flex-col gap-1">
        <label htmlFor={`${uid}-reason`} className="text-sm font-medium">
          Reason (required — every backer&apos;s refund e-mail quotes it)
        </label>
        <textarea
          id={`${uid}-reason`}
          rows={3}
          className="w-full rounded-lg border border-line bg-surface px-3 py-2 text-sm aria-invalid:border-rose aria-invalid:bg-rose-soft/30"
          aria-invalid={error ? true : undefined}
          aria-describedby={error ? `${uid}-reason-error` : undefined}
          {...register("reason")}
        />
        {error ? (
          <p id={`${uid}-reason-error`} className="text-xs font-medium text-rose">
            {error}
          </p>
        ) : null}
      </div>
      {errors.root?.message ? <p className="text-xs font-medium text-rose">{errors.root.message}</p> : null}
      {done ? (
        <p role="status" className="rounded-md bg-moss-soft p-2 text-sm">
          {done}
        </p>
      ) : null}
      <div>
        <Button type="submit" variant="danger" disabled={isSubmitting || isSubmitSuccessful}>
          {isSubmitting ? "Withdrawing…" : `Withdraw and refund ${paidPledges === 1 ? "1 paid pledge" : `${paidPledges} paid pledges`}`}
        </Button>
      </div>
      <p className="text-xs text-muted">
        This cannot be undone: the campaign stops taking pledges, every paid pledge is refunded in full through the card processor,
        and any lab-fund money goes back to the fund.
      </p>
    </form>
  );
}
