import { formatDateTime } from "@/lib/format";
import { ReportMarkdown } from "./report-markdown";

export type LabNoteView = { id: string; bodyMd: string; publishedAt: Date | null; createdAt: Date; authorName: string | null };

/** A campaign's lab notes, newest first, as backers see them. */
export function LabNotesList({ notes, timeZone }: { notes: readonly LabNoteView[]; timeZone: string }) {
  return (
    <ol className="flex flex-col gap-3">
      {notes.map((note) => {
        const at = note.publishedAt ?? note.createdAt;
        return (
          <li key={note.id} className="rounded-lg border border-line bg-surface p-4" data-testid="lab-note">
            <p className="mb-2 text-xs text-muted">
              <time dateTime={at.toISOString()}>{formatDateTime(at, timeZone)}</time>
              {note.authorName ? ` · ${note.authorName}` : ""}
            </p>
            <ReportMarkdown markdown={note.bodyMd} className="text-sm" />
          </li>
        );
      })}
    </ol>
  );
}
