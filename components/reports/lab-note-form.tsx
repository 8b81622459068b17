"use client";

import { useRouter } from "next/navigation";
import { useState, useTransition } from "react";
import { postLabNoteAction } from "@/app/lab/reports/[campaignId]/actions";
import { Button } from "@/components/ui/button";
import { LAB_NOTE_MAX } from "@/lib/validation/report";
import { ReportMarkdown } from "./report-markdown";

/** A short markdown note to a campaign's backers; posted at once and e-mailed. */
export function LabNoteForm({ campaignId }: { campaignId: string }) {
  const router = useRouter();
  const [bodyMd, setBodyMd] = useState("");
  const [error, setError] = useState<string | null>(null);
  const [status, setStatus] = useState<string | null>(null);
  const [pending, startTransition] = useTransition();

  return (
    <form
      className="flex flex-col gap-3"
      onSubmit={(event) => {
        event.preventDefault();
        setError(null);
        setStatus(null);
        startTransition(async () => {
          const result = await postLabNoteAction(campaignId, { bodyMd });
          if (!result.ok) {
            setError(result.fields?.bodyMd ?? result.message);
            return;
          }
          setBodyMd("");
          setStatus(`Posted; ${result.data.mailed} ${result.data.mailed === 1 ? "backer" : "backers"} will be e-mailed.`);
          router.refresh();
        });
      }}
    >
      <div className="grid gap-3 md:grid-cols-2">
        <label className="flex flex-col gap-1 text-sm">
          <span className="font-medium">New lab note (markdown)</span>
          <textarea
            name="labNote"
            value={bodyMd}
            maxLength={LAB_NOTE_MAX}
            rows={5}
            placeholder="A failed print, a delay, a first photo…"
            onChange={(e) => setBodyMd(e.target.value)}
            aria-invalid={error ? true : undefined}
            className="rounded-md border border-line px-3 py-2 text-sm"
          />
        </label>
        <div className="flex flex-col gap-1 text-sm">
          <span className="font-medium">Preview</span>
          <div className="min-h-24 rounded-md border border-dashed border-line p-3">
            <ReportMarkdown markdown={bodyMd} empty="The note appears here as backers will see it." />
          </div>
        </div>
      </div>
      {error ? <p role="alert" className="text-sm text-rose">{error}</p> : null}
      {status ? <p role="status" className="text-sm text-moss">{status}</p> : null}
      <div>
        <Button type="submit" size="sm" disabled={pending || bodyMd.trim().length === 0}>
          Post and e-mail backers
        </Button>
      </div>
    </form>
  );
}
