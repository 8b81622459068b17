"use client";

import Image from "next/image";
import { Box, Image as ImageIcon, Paperclip, X } from "lucide";
import { useId, useRef } from "react";
import { uploadWithProgress, type UploadProgress } from "@/components/estimate/upload-with-progress";
import { Button } from "@/components/ui/button";
import { Icon } from "@/components/ui/icon";
import { ProgressBar } from "@/components/ui/progress-bar";
import type { ProposalUploadView } from "@/db/queries/proposal-reads";
import { MODEL_UPLOAD_LIMIT_BYTES } from "@/lib/validation/model-analysis";
import { formatBytes } from "./format";
import type { UploadItem } from "./form-values";
import { ModelFigures } from "./model-figures";

/** Photos may be at most 15 MB (the uploads endpoint's limit; models: 64 MB, MODEL_UPLOAD_LIMIT_BYTES). */
export const PHOTO_UPLOAD_LIMIT_BYTES = 15 * 1024 * 1024;
export const MAX_ATTACHMENTS = 20;

type ErrorBody = { error?: { message?: string; fields?: Record<string, string> } } | null;
type UploadBody = { upload?: ProposalUploadView } | null;

function guessKind(file: File): UploadItem["guessedKind"] {
  if (/\.(stl|3mf)$/i.test(file.name)) return "model";
  if (file.type.startsWith("image/")) return "photo";
  return "unknown";
}

/** The size limit the file will meet, judged by its name and type (the server judges by its content). */
function tooLarge(file: File, kind: UploadItem["guessedKind"]): string | undefined {
  if (kind === "model" && file.size > MODEL_UPLOAD_LIMIT_BYTES) return "Model files can be at most 64 MB.";
  if (kind === "photo" && file.size > PHOTO_UPLOAD_LIMIT_BYTES) return "Photos can be at most 15 MB.";
  if (file.size === 0) return "That file is empty.";
  return undefined;
}

/**
 * Files attached to a proposal. Each chosen file uploads at once, with its own progress bar, to
 * `POST /api/uploads`; the form sends the finished uploads' ids when it is saved.
 */
export function UploadField({
  items,
  onChange,
  proposalId,
  error,
}: {
  items: UploadItem[];
  onChange: (update: (items: UploadItem[]) => UploadItem[]) => void;
  proposalId: string | null;
  error?: string;
}) {
  const inputId = useId();
  const aborts = useRef(new Map<string, AbortController>());
  const serial = useRef(0);

  const patch = (key: string, change: Partial<UploadItem>) =>
    onChange((all) => all.map((item) => (item.key === key ? { ...item, ...change } : item)));

  async function start(file: File) {
    const key = `local-${serial.current++}`;
    const guessedKind = guessKind(file);
    const refused = tooLarge(file, guessedKind);
    onChange((all) => [
      ...all,
      { key, name: file.name, sizeBytes: file.size, status: refused ? "error" : "uploading", fraction: 0, guessedKind, error: refused },
    ]);
    if (refused) return;
    const form = new FormData();
    form.set("file", file);
    if (proposalId) form.set("proposalId", proposalId);
    const abort = new AbortController();
    aborts.current.set(key, abort);
    try {
      const response = await uploadWithProgress(
        "/api/uploads",
        form,
        (progress: UploadProgress) =>
          patch(key, progress.phase === "uploading" ? { fraction: progress.fraction } : { status: "processing", fraction: 1 }),
        abort.signal,
      );
      const upload = response.status === 200 || response.status === 201 ? (response.body as UploadBody)?.upload : undefined;
      if (upload) {
        onChange((all) =>
          all.some((item) => item.key !== key && item.upload?.id === upload.id)
            ? // The same file again (the server keeps one copy per person): show it once.
              all.filter((item) => item.key !== key)
            : all.map((item) => (item.key === key ? { ...item, status: "done", fraction: 1, upload, name: upload.originalName } : item)),
        );
      } else {
        const body = response.body as ErrorBody;
        patch(key, {
          status: "error",
          error: body?.error?.fields?.file ?? body?.error?.message ?? `The upload failed: the server answered ${response.status}.`,
        });
      }
    } catch (failure) {
      if (failure instanceof DOMException && failure.name === "AbortError") return;
      patch(key, { status: "error", error: failure instanceof Error ? failure.message : "The upload failed." });
    } finally {
      aborts.current.delete(key);
    }
  }

  function choose(event: React.ChangeEvent<HTMLInputElement>) {
    const files = Array.from(event.target.files ?? []);
    event.target.value = "";
    const room = MAX_ATTACHMENTS - items.filter((item) => item.status !== "error").length;
    files.slice(0, Math.max(0, room)).forEach((file) => void start(file));
    if (files.length > room) {
      onChange((all) => [
        ...all,
        {
          key: `local-${serial.current++}`,
          name: `${files.length - Math.max(0, room)} more file(s)`,
          sizeBytes: 0,
          status: "error",
          fraction: 0,
          guessedKind: "unknown",
          error: `A proposal can have at most ${MAX_ATTACHMENTS} files.`,
        },
      ]);
    }
  }

  function remove(key: string) {
    aborts.current.get(key)?.abort();
    onChange((all) => all.filter((item) => item.key !== key));
  }

  const hintId = `${inputId}-hint`;
  return (
    <fieldset className="flex flex-col gap-3 rounded-lg border border-line p-4">
      <legend className="px-1 text-base font-semibold">Files</legend>
      <p id={hintId} className="-mt-1 text-sm text-muted">
        The part&apos;s model file (STL or 3MF, up to 64 MB each) and photos (JPEG, PNG or WebP, up to 15 MB each). Each file uploads as soon as you
        choose it; model files are measured for volume, size, filament and print time.
      </p>
      <div>
        <label
          htmlFor={inputId}
          className="inline-flex cursor-pointer items-center gap-2 rounded-lg border border-line bg-surface px-4 py-2.5 text-sm font-semibold hover:border-teal hover:text-teal focus-within:outline focus-within:outline-3 focus-within:outline-ember"
        >
          <Icon node={Paperclip} /> Choose files
          <input
            id={inputId}
            type="file"
            multiple
            accept=".stl,.3mf,model/stl,model/3mf,image/jpeg,image/png,image/webp"
            onChange={choose}
            aria-describedby={hintId}
            className="sr-only"
          />
        </label>
      </div>
      {error ? <p className="text-xs font-medium text-rose">{error}</p> : null}
      {items.length > 0 ? (
        <ul className="flex flex-col gap-2" aria-label="Attached files">
          {items.map((item) => (
            <li key={item.key}>
              <UploadRow item={item} onRemove={() => remove(item.key)} />
            </li>
          ))}
        </ul>
      ) : null}
    </fieldset>
  );
}

function UploadRow({ item, onRemove }: { item: UploadItem; onRemove: () => void }) {
  const kind = item.upload?.kind ?? item.guessedKind;
  const errorId = `${item.key}-error`;
  return (
    <div
      className="flex flex-col gap-2 rounded-lg border border-line bg-paper/50 p-3 aria-invalid:border-rose/50 aria-invalid:bg-rose-soft/30"
      aria-invalid={item.status === "error" ? true : undefined}
      data-testid="upload-row"
    >
      <div className="flex items-start gap-3">
        <Thumbnail item={item} />
        <div className="flex min-w-0 flex-1 flex-col gap-0.5">
          <p className="truncate text-sm font-medium" title={item.name}>
            {item.upload ? (
              <a href={item.upload.url} className="text-teal underline" target="_blank" rel="noopener">
                {item.name}
              </a>
            ) : (
              item.name
            )}
          </p>
          <p className="text-xs text-muted">
            {kind === "model" ? "Model" : kind === "photo" ? "Photo" : "File"}
            {item.sizeBytes > 0 ? ` · ${formatBytes(item.sizeBytes)}` : ""}
            {item.upload?.widthPx && item.upload.heightPx ? ` · ${item.upload.widthPx} × ${item.upload.heightPx} px` : ""}
          </p>
        </div>
        <Button type="button" variant="quiet" size="sm" onClick={onRemove} aria-label={`Remove ${item.name}`}>
          <Icon node={X} /> {item.status === "uploading" ? "Cancel" : "Remove"}
        </Button>
      </div>
      {item.status === "uploading" || item.status === "processing" ? (
        <div className="flex flex-col gap-1" aria-live="polite">
          <ProgressBar
            percent={item.fraction * 100}
            label={item.status === "uploading" ? `Uploading ${item.name}` : `Processing ${item.name}`}
          />
          <span className="text-xs text-muted">
            {item.status === "uploading"
              ? `Uploading… ${Math.round(item.fraction * 100)} %`
              : kind === "model"
                ? "Uploaded — measuring the mesh…"
                : "Uploaded — processing…"}
          </span>
        </div>
      ) : null}
      {item.status === "error" ? (
        <p id={errorId} role="alert" className="text-sm font-medium text-rose">
          {item.error}
        </p>
      ) : null}
      {item.upload?.kind === "model" && item.upload.analysis ? <ModelFigures analysis={item.upload.analysis} compact /> : null}
    </div>
  );
}

function Thumbnail({ item }: { item: UploadItem }) {
  const thumbnail = item.upload?.thumbnailUrl;
  const kind = item.upload?.kind ?? item.guessedKind;
  return (
    <span className="relative flex h-14 w-14 shrink-0 items-center justify-center overflow-hidden rounded-md border border-line bg-slate-soft text-muted">
      {thumbnail ? (
        <Image src={thumbnail} alt="" fill unoptimized sizes="3.5rem" className="object-cover" />
      ) : (
        <Icon node={kind === "model" ? Box : ImageIcon} className="h-6 w-6" />
      )}
    </span>
  );
}
