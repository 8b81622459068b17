"use client";

import { useState } from "react";
import { Button } from "@/components/ui/button";
import { ProgressBar } from "@/components/ui/progress-bar";
import type { BlindPairChoice } from "@/lib/validation/blind-pairs";
import type { NextPairResponse } from "@/server/blind-pairs";

type ErrorBody = { error?: { code?: string; message?: string } };

/** Codes after which this pair cannot be voted on again: fetch a fresh one instead. */
const FETCH_NEXT_ON = new Set(["ticket_used", "already_voted", "ticket_expired", "pair_gone"]);

/**
 * Two photos of one piece, variants hidden, in the order the server chose; three answers; then the
 * next pair. The server checks everything (ticket, timing, one vote per pair); this only shows it.
 */
export function JudgePairs({ slug, initial }: { slug: string; initial: NextPairResponse }) {
  const [state, setState] = useState(initial);
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<string | null>(null);
  const [honeypot, setHoneypot] = useState("");
  const endpoint = `/api/blind-pairs/campaigns/${encodeURIComponent(slug)}`;

  async function loadNext() {
    const response = await fetch(endpoint, { headers: { accept: "application/json" } });
    const body = (await response.json().catch(() => null)) as (NextPairResponse & ErrorBody) | null;
    if (response.ok && body) setState(body);
    else setMessage(body?.error?.message ?? `The server answered ${response.status}; reload the page.`);
  }

  async function choose(choice: BlindPairChoice) {
    if (!state.pair || busy) return;
    setBusy(true);
    setMessage(null);
    try {
      const response = await fetch(endpoint, {
        method: "POST",
        headers: { "content-type": "application/json", accept: "application/json" },
        body: JSON.stringify({ ticket: state.pair.ticket, choice, website: honeypot }),
      });
      const body = (await response.json().catch(() => null)) as (NextPairResponse & ErrorBody) | null;
      if (response.ok && body) {
        setState(body);
        return;
      }
      setMessage(body?.error?.message ?? `The server answered ${response.status}; try again.`);
      if (body?.error?.code && FETCH_NEXT_ON.has(body.error.code)) await loadNext();
    } catch {
      setMessage("Could not reach the server; check the connection and try again.");
    } finally {
      setBusy(false);
    }
  }

  const { judged, total } = state.progress;
  const percent = total === 0 ? 100 : Math.round((judged / total) * 100);

  return (
    <div className="flex flex-col gap-5">
      <div className="flex flex-col gap-1.5">
        <p className="text-sm" data-testid="judge-progress" aria-live="polite">
          <strong>{judged}</strong> of {total} pairs judged
        </p>
        <ProgressBar percent={percent} label={`${judged} of ${total} pairs judged`} />
      </div>

      {state.pair ? (
        <section aria-labelledby="pair-heading" className="flex flex-col gap-4">
          <h2 id="pair-heading" className="text-lg font-semibold">
            {state.pair.pieceName}: which print came out better?
          </h2>
          <div className="grid gap-4 sm:grid-cols-2">
            {[
              { side: "Left", url: state.pair.left.imageUrl },
              { side: "Right", url: state.pair.right.imageUrl },
            ].map(({ side, url }) => (
              <figure key={url} className="overflow-hidden rounded-lg border border-line bg-slate-soft">
                {/* eslint-disable-next-line @next/next/no-img-element -- served by our blind image route by opaque token */}
                <img src={url} alt={`${side} photo of the ${state.pair?.pieceName ?? "piece"}`} className="aspect-[4/3] w-full object-contain" />
                <figcaption className="px-3 py-1.5 text-center text-sm font-medium">{side}</figcaption>
              </figure>
            ))}
          </div>
          {/* A field people never see or reach; automated form fillers tend to fill it. */}
          <div aria-hidden="true" className="absolute -left-[9999px] h-px w-px overflow-hidden">
            <label>
              Website
              <input type="text" name="website" tabIndex={-1} autoComplete="off" value={honeypot} onChange={(event) => setHoneypot(event.target.value)} />
            </label>
          </div>
          <div className="flex flex-wrap justify-center gap-3">
            <Button onClick={() => choose("left")} disabled={busy}>
              Left is better
            </Button>
            <Button variant="secondary" onClick={() => choose("tie")} disabled={busy}>
              Can&apos;t tell
            </Button>
            <Button onClick={() => choose("right")} disabled={busy}>
              Right is better
            </Button>
          </div>
        </section>
      ) : (
        <p role="status" data-testid="judge-done" className="rounded-lg border border-teal/30 bg-teal-soft p-4">
          You have judged every pair of this campaign. Thank you — the ranking on the report updates as votes come in.
        </p>
      )}

      {message ? (
        <p role="alert" className="rounded-lg border border-rose/30 bg-rose/5 p-3 text-sm">
          {message}
        </p>
      ) : null}
    </div>
  );
}
