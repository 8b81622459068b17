"use client";

import { skipToken, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { Check, ThumbsUp } from "lucide";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Icon } from "@/components/ui/icon";
import type { VoteStatus } from "@/db/queries/proposal-commands";
import { cn } from "@/lib/cn";
import { formatVotes } from "./format";

type Allowance = Pick<VoteStatus, "allowance" | "votesLeft">;
type Intent = "cast" | "withdraw";
type ErrorBody = { error?: { message?: string } } | null;

const allowanceKey = ["vote-allowance"] as const;
const voteKey = (proposalId: string) => ["proposal-vote", proposalId] as const;

/*
 * The server renders every figure; these queries only hold them so a vote can change them at once.
 * skipToken: nothing is fetched, the cache is filled from the page and from the vote responses.
 */
function useAllowance(initial: Allowance) {
  return useQuery({ queryKey: allowanceKey, queryFn: skipToken, initialData: initial }).data ?? initial;
}

async function sendVote(proposalId: string, intent: Intent): Promise<VoteStatus> {
  const response = await fetch(`/api/proposals/${encodeURIComponent(proposalId)}/vote`, {
    method: intent === "cast" ? "POST" : "DELETE",
    headers: { accept: "application/json" },
  });
  const body = (await response.json().catch(() => null)) as (VoteStatus & ErrorBody) | null;
  if (!response.ok || !body) throw new Error(body?.error?.message ?? `The server answered ${response.status}; try again.`);
  return body;
}

/** "n votes left this month", kept in step with every vote on the page. */
export function VotesLeft({ initial, className }: { initial: Allowance; className?: string }) {
  const { votesLeft, allowance } = useAllowance(initial);
  return (
    <p className={cn("text-sm", className)} aria-live="polite" data-testid="votes-left">
      <strong className="font-semibold">{votesLeft}</strong> {votesLeft === 1 ? "vote" : "votes"} left this month
      <span className="text-muted"> of your {allowance}</span>
      {votesLeft === 0 ? <span className="block text-xs text-muted">New votes arrive on the 1st.</span> : null}
    </p>
  );
}

/** A member's vote on one submitted proposal: the count and "voted" change at once, and roll back on error. */
export function VoteButton({ initial, title, className }: { initial: VoteStatus; title: string; className?: string }) {
  const queryClient = useQueryClient();
  const key = voteKey(initial.proposalId);
  const status = useQuery({ queryKey: key, queryFn: skipToken, initialData: initial }).data ?? initial;
  const { votesLeft } = useAllowance({ allowance: initial.allowance, votesLeft: initial.votesLeft });
  const [error, setError] = useState<string | null>(null);

  const shiftAllowance = (delta: number) =>
    queryClient.setQueryData<Allowance>(allowanceKey, (current) =>
      current ? { ...current, votesLeft: Math.min(current.allowance, Math.max(0, current.votesLeft + delta)) } : current,
    );

  const mutation = useMutation({
    mutationFn: (intent: Intent) => sendVote(initial.proposalId, intent),
    onMutate: async (intent) => {
      setError(null);
      await queryClient.cancelQueries({ queryKey: key });
      const previous = queryClient.getQueryData<VoteStatus>(key);
      const cast = intent === "cast";
      queryClient.setQueryData<VoteStatus>(key, (current) =>
        current ? { ...current, votedByMe: cast, voteCount: Math.max(0, current.voteCount + (cast ? 1 : -1)) } : current,
      );
      // Undone by the same delta on error, so a vote on another proposal meanwhile is not lost.
      const delta = cast ? -1 : 1;
      shiftAllowance(delta);
      return { previous, delta };
    },
    onError: (failure, _intent, context) => {
      if (context?.previous) queryClient.setQueryData(key, context.previous);
      if (context) shiftAllowance(-context.delta);
      setError(failure.message);
    },
    onSuccess: (next) => {
      queryClient.setQueryData(key, next);
      queryClient.setQueryData<Allowance>(allowanceKey, { allowance: next.allowance, votesLeft: next.votesLeft });
    },
  });

  const noneLeft = !status.votedByMe && votesLeft === 0;
  const errorId = `vote-error-${initial.proposalId}`;
  return (
    <div className={cn("flex flex-col items-start gap-1.5", className)}>
      <div className="flex flex-wrap items-center gap-2">
        <span className="min-w-[4.5rem] text-sm font-semibold" data-testid="vote-count" aria-live="polite">
          {formatVotes(status.voteCount)}
        </span>
        {status.votedByMe ? (
          <>
            <span className="inline-flex items-center gap-1 rounded-md bg-moss-soft px-2 py-1 text-xs font-semibold text-moss">
              <Icon node={Check} className="h-3.5 w-3.5" /> Voted
            </span>
            <Button
              type="button"
              variant="quiet"
              size="sm"
              disabled={mutation.isPending}
              onClick={() => mutation.mutate("withdraw")}
              aria-label={`Withdraw your vote for ${title}`}
              aria-describedby={error ? errorId : undefined}
            >
              Withdraw
            </Button>
          </>
        ) : (
          <Button
            type="button"
            variant="secondary"
            size="sm"
            disabled={mutation.isPending || noneLeft}
            onClick={() => mutation.mutate("cast")}
            aria-label={`Vote for ${title}`}
            aria-describedby={error ? errorId : undefined}
            title={noneLeft ? "No votes left this month; new votes arrive on the 1st." : undefined}
          >
            <Icon node={ThumbsUp} className="h-3.5 w-3.5" /> Vote
          </Button>
        )}
      </div>
      {error ? (
        <p id={errorId} role="alert" className="text-xs font-medium text-rose">
          {error}
        </p>
      ) : null}
    </div>
  );
}
