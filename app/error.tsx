"use client";

import { RotateCcw } from "lucide-react";

export default function ErrorPage({ reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <div className="mx-auto flex max-w-md flex-col gap-4 rounded-[var(--radius-card)] border border-line bg-surface p-5">
      <h1 className="text-2xl font-bold">Something went wrong on our side</h1>
      <p>Nothing you entered was lost. Try again; if it keeps happening, tell the lab.</p>
      <button type="button" onClick={reset} className="inline-flex w-fit items-center gap-2 rounded-lg bg-teal px-4 py-2.5 text-sm font-semibold text-white">
        <RotateCcw className="h-4 w-4" aria-hidden="true" /> Try again
      </button>
    </div>
  );
}
