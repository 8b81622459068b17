import { cn } from "@/lib/cn";

/** A funding bar; the fill is capped visually at 100 % while the label says the true share. */
export function ProgressBar({ percent, label, className }: { percent: number; label: string; className?: string }) {
  const shown = Math.max(0, Math.min(100, percent));
  return (
    <div
      role="progressbar"
      aria-valuemin={0}
      aria-valuemax={100}
      aria-valuenow={Math.round(shown)}
      aria-label={label}
      className={cn("h-2.5 w-full overflow-hidden rounded-full bg-slate-soft", className)}
    >
      <div className={cn("h-full rounded-full", percent >= 100 ? "bg-moss" : "bg-teal")} style={{ width: `${shown}%` }} />
    </div>
  );
}
