"use client";

export default function ErrorPage({ reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <div className="mx-auto flex max-w-md flex-col gap-4 rounded-[var(--radius-card)] border border-line bg-surface p-5">
      <h1 className="text-2xl font-bold">Something went wrong on our side</h1>
      <p>Nothing you entered was lost. Try again; if it keeps happening, tell the lab.</p>
      <button type="button" onClick={reset} className="w-fit rounded-lg bg-teal px-4 py-2.5 text-sm font-semibold text-white">
        Try again
      </button>
    </div>
  );
}
