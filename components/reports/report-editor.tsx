"use client";

import { useRouter } from "next/navigation";
import { useId, useState, useTransition } from "react";
import { ArrowDown, ArrowUp, Trash2, Upload as UploadIcon } from "lucide-react";
import { publishReportAction, saveReportDraftAction } from "@/app/lab/reports/[campaignId]/actions";
import { uploadWithProgress } from "@/components/estimate/upload-with-progress";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { cn } from "@/lib/cn";
import { formatScore, REPORT_CRITERIA, SCORE_LABELS, SCORE_MAX, SCORE_MIN, type CriterionId } from "@/lib/reports/criteria";
import { uploadThumbnailUrl } from "@/lib/uploads/api";
import { REPORT_BODY_MAX, REPORT_SUMMARY_MAX, type ReportDraftValues } from "@/lib/validation/report";
import { ReportMarkdown } from "./report-markdown";

export type EditorPhoto = { uploadId: string; pieceId: string; variantId: string; caption: string; lightSetKey: string | null; originalName?: string };
export type EditorScore = { pieceId: string | null; variantId: string; criterion: CriterionId; score: number; note: string };

type Props = {
  campaign: { id: string; title: string; slug: string };
  pieces: { id: string; name: string }[];
  variants: { id: string; name: string; isReference: boolean }[];
  initial: { summary: string; bodyMd: string; videoUrl: string; actualCost: string; scores: EditorScore[]; photos: EditorPhoto[] };
  /** The run log's cost, formatted, when jobs have been logged. */
  runCostText: string | null;
  currency: string;
};

type Failure = { message: string; fields?: Record<string, string> };

const scoreOptions = Array.from({ length: SCORE_MAX - SCORE_MIN + 1 }, (_, i) => SCORE_MIN + i);

export function ReportEditor({ campaign, pieces, variants, initial, runCostText, currency }: Props) {
  const router = useRouter();
  const formId = useId();
  const [summary, setSummary] = useState(initial.summary);
  const [bodyMd, setBodyMd] = useState(initial.bodyMd);
  const [videoUrl, setVideoUrl] = useState(initial.videoUrl);
  const [actualCost, setActualCost] = useState(initial.actualCost);
  const [scores, setScores] = useState<EditorScore[]>(initial.scores);
  const [photos, setPhotos] = useState<EditorPhoto[]>(initial.photos);
  const [failure, setFailure] = useState<Failure | null>(null);
  const [status, setStatus] = useState<string | null>(null);
  const [uploading, setUploading] = useState<Record<string, string>>({});
  const [pending, startTransition] = useTransition();
  const compared = variants.filter((variant) => !variant.isReference);
  const reference = variants.find((variant) => variant.isReference);

  const values = (): ReportDraftValues => ({
    summary,
    bodyMd,
    videoUrl,
    actualCost,
    scores,
    photos: photos.map(({ uploadId, pieceId, variantId, caption, lightSetKey }) => ({ uploadId, pieceId, variantId, caption, lightSetKey })),
  });

  function run(kind: "save" | "publish") {
    setFailure(null);
    setStatus(null);
    startTransition(async () => {
      const result = kind === "save" ? await saveReportDraftAction(campaign.id, values()) : await publishReportAction(campaign.id, values());
      if (!result.ok) {
        setFailure({ message: result.message, fields: result.fields });
        return;
      }
      if (kind === "save") {
        setStatus("Draft saved.");
        router.refresh();
      } else {
        router.push(`/reports/${campaign.slug}`);
      }
    });
  }

  const fieldError = (name: string) => failure?.fields?.[name];

  function scoreOf(variantId: string, criterion: CriterionId) {
    return scores.find((s) => s.pieceId === null && s.variantId === variantId && s.criterion === criterion);
  }

  function setScore(variantId: string, criterion: CriterionId, patch: Partial<Pick<EditorScore, "score" | "note">> | null) {
    setScores((current) => {
      const rest = current.filter((s) => !(s.pieceId === null && s.variantId === variantId && s.criterion === criterion));
      if (patch === null) return rest;
      const existing = current.find((s) => s.pieceId === null && s.variantId === variantId && s.criterion === criterion);
      return [...rest, { pieceId: null, variantId, criterion, score: 0, note: "", ...existing, ...patch }];
    });
  }

  function slotPhotos(pieceId: string, variantId: string) {
    return photos.filter((p) => p.pieceId === pieceId && p.variantId === variantId);
  }

  function updatePhoto(target: EditorPhoto, patch: Partial<EditorPhoto>) {
    setPhotos((current) => current.map((p) => (p === target ? { ...p, ...patch } : p)));
  }

  function movePhoto(target: EditorPhoto, step: -1 | 1) {
    setPhotos((current) => {
      const slot = current.filter((p) => p.pieceId === target.pieceId && p.variantId === target.variantId);
      const index = slot.indexOf(target);
      const swapWith = slot[index + step];
      if (!swapWith) return current;
      return current.map((p) => (p === target ? swapWith : p === swapWith ? target : p));
    });
  }

  async function addPhotos(pieceId: string, variantId: string, files: FileList | null) {
    if (!files) return;
    const slot = `${pieceId}|${variantId}`;
    for (const file of Array.from(files)) {
      setUploading((u) => ({ ...u, [slot]: `Uploading ${file.name}…` }));
      const form = new FormData();
      form.append("file", file);
      try {
        const { status: code, body } = await uploadWithProgress("/api/uploads", form, (progress) =>
          setUploading((u) => ({
            ...u,
            [slot]: progress.phase === "uploading" ? `Uploading ${file.name}: ${Math.round(progress.fraction * 100)} %` : `Cleaning ${file.name}…`,
          })),
        );
        const upload = (body as { upload?: { id: string; kind: string; originalName: string } } | null)?.upload;
        if (code >= 300 || !upload) {
          const message = (body as { error?: { message?: string } } | null)?.error?.message ?? `The upload failed (HTTP ${code}).`;
          setFailure({ message: `${file.name}: ${message}` });
          continue;
        }
        if (upload.kind !== "photo") {
          setFailure({ message: `${file.name} is not a photo.` });
          continue;
        }
        setPhotos((current) =>
          current.some((p) => p.uploadId === upload.id && p.pieceId === pieceId && p.variantId === variantId)
            ? current
            : [...current, { uploadId: upload.id, pieceId, variantId, caption: "", lightSetKey: null, originalName: upload.originalName }],
        );
      } catch (error) {
        setFailure({ message: error instanceof Error ? error.message : "The upload failed." });
      }
    }
    setUploading((u) => {
      const { [slot]: _done, ...rest } = u;
      return rest;
    });
  }

  const otherFieldErrors = Object.entries(failure?.fields ?? {}).filter(([name]) => !["summary", "bodyMd", "videoUrl", "actualCost"].includes(name));

  return (
    <form
      id={formId}
      className="flex flex-col gap-6"
      onSubmit={(event) => {
        event.preventDefault();
        run("save");
      }}
    >
      <Card className="flex flex-col gap-4">
        <h2 className="text-lg font-semibold">Summary and links</h2>
        <label className="flex flex-col gap-1 text-sm">
          <span className="font-medium">Summary (the feed entry and the share text)</span>
          <textarea
            name="summary"
            value={summary}
            maxLength={REPORT_SUMMARY_MAX}
            rows={3}
            onChange={(e) => setSummary(e.target.value)}
            aria-invalid={fieldError("summary") ? true : undefined}
            className="rounded-md border border-line px-3 py-2"
          />
          <FieldError message={fieldError("summary")} />
        </label>
        <div className="grid gap-4 sm:grid-cols-2">
          <label className="flex flex-col gap-1 text-sm">
            <span className="font-medium">Video link (optional, https)</span>
            <input
              name="videoUrl"
              type="url"
              inputMode="url"
              value={videoUrl}
              placeholder="https://"
              onChange={(e) => setVideoUrl(e.target.value)}
              aria-invalid={fieldError("videoUrl") ? true : undefined}
              className="rounded-md border border-line px-3 py-2"
            />
            <FieldError message={fieldError("videoUrl")} />
          </label>
          <label className="flex flex-col gap-1 text-sm">
            <span className="font-medium">Actually spent ({currency})</span>
            <input
              name="actualCost"
              inputMode="decimal"
              value={actualCost}
              placeholder={runCostText ? `blank = run log, ${runCostText}` : "e.g. 312.50"}
              onChange={(e) => setActualCost(e.target.value)}
              aria-invalid={fieldError("actualCost") ? true : undefined}
              className="rounded-md border border-line px-3 py-2"
            />
            <span className="text-xs text-muted">
              {runCostText ? `From the run log: ${runCostText}. Leave blank to use it.` : "No runs logged yet: enter what the test cost."}
            </span>
            <FieldError message={fieldError("actualCost")} />
          </label>
        </div>
      </Card>

      <Card className="flex flex-col gap-3">
        <h2 className="text-lg font-semibold">Scorecard</h2>
        <p className="text-sm text-muted">
          Each variant against the reference variant{reference ? `, ${reference.name}` : ""}. {formatScore(SCORE_MIN)} {SCORE_LABELS[SCORE_MIN]}, 0{" "}
          {SCORE_LABELS[0]}, {formatScore(SCORE_MAX)} {SCORE_LABELS[SCORE_MAX]}. Leave a cell unscored when the run did not show it.
        </p>
        <div className="overflow-x-auto">
          <table className="w-full text-sm">
            <thead className="text-left text-muted">
              <tr>
                <th scope="col" className="py-2 pr-3 font-medium">Criterion</th>
                {compared.map((variant) => (
                  <th key={variant.id} scope="col" className="px-2 py-2 font-medium">{variant.name}</th>
                ))}
              </tr>
            </thead>
            <tbody>
              {REPORT_CRITERIA.map((criterion) => (
                <tr key={criterion.id} className="border-t border-line align-top">
                  <th scope="row" className="py-2 pr-3 text-left font-medium">
                    {criterion.label}
                    <span className="block text-xs font-normal text-muted">{criterion.hint}</span>
                  </th>
                  {compared.map((variant) => {
                    const cell = scoreOf(variant.id, criterion.id);
                    return (
                      <td key={variant.id} className="px-2 py-2">
                        <select
                          aria-label={`${criterion.label}, ${variant.name}`}
                          value={cell ? String(cell.score) : ""}
                          onChange={(e) => setScore(variant.id, criterion.id, e.target.value === "" ? null : { score: Number(e.target.value) })}
                          className="w-full rounded-md border border-line px-2 py-1"
                        >
                          <option value="">not scored</option>
                          {scoreOptions.map((value) => (
                            <option key={value} value={value}>
                              {formatScore(value)} {SCORE_LABELS[value]}
                            </option>
                          ))}
                        </select>
                        {cell ? (
                          <input
                            aria-label={`Note on ${criterion.label}, ${variant.name}`}
                            value={cell.note}
                            maxLength={300}
                            placeholder="note (optional)"
                            onChange={(e) => setScore(variant.id, criterion.id, { note: e.target.value })}
                            className="mt-1 w-full rounded-md border border-line px-2 py-1 text-xs"
                          />
                        ) : null}
                      </td>
                    );
                  })}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </Card>

      <Card className="flex flex-col gap-4">
        <h2 className="text-lg font-semibold">Photos</h2>
        <p className="text-sm text-muted">
          One slot per piece and variant. Give shots taken in the same light the same light-set key (for example “box-1”): the
          report puts those side by side when comparing two variants. Photos are re-encoded without their metadata on upload.
        </p>
        {pieces.map((piece) => (
          <fieldset key={piece.id} className="rounded-lg border border-line p-3">
            <legend className="px-1 text-sm font-semibold">{piece.name}</legend>
            <div className="flex flex-col gap-3">
              {variants.map((variant) => {
                const slot = slotPhotos(piece.id, variant.id);
                const slotKey = `${piece.id}|${variant.id}`;
                return (
                  <div key={variant.id} data-testid={`slot-${piece.id}-${variant.id}`} className="flex flex-col gap-2">
                    <div className="flex flex-wrap items-center justify-between gap-2">
                      <h3 className="text-sm font-medium">
                        {variant.name}
                        {variant.isReference ? <span className="ml-2 rounded bg-slate-soft px-1.5 text-xs text-muted">reference</span> : null}
                      </h3>
                      <label className="inline-flex cursor-pointer items-center gap-1 rounded-md border border-line px-2 py-1 text-xs font-medium hover:border-teal">
                        <UploadIcon className="h-3.5 w-3.5" aria-hidden="true" /> Add photos
                        <input
                          type="file"
                          accept="image/jpeg,image/png,image/webp"
                          multiple
                          className="sr-only"
                          onChange={(e) => {
                            void addPhotos(piece.id, variant.id, e.target.files);
                            e.target.value = "";
                          }}
                        />
                      </label>
                    </div>
                    {uploading[slotKey] ? <p className="text-xs text-muted" role="status">{uploading[slotKey]}</p> : null}
                    {slot.length === 0 ? <p className="text-xs text-muted">No photos yet.</p> : null}
                    <ul className="grid gap-2 sm:grid-cols-2 lg:grid-cols-3">
                      {slot.map((photo, index) => (
                        <li key={`${photo.uploadId}`} className="flex gap-2 rounded-md border border-line p-2">
                          {/* eslint-disable-next-line @next/next/no-img-element -- served by our own upload route, thumbnails already sized */}
                          <img src={uploadThumbnailUrl(photo.uploadId)} alt={photo.caption || `${piece.name}, ${variant.name}`} className="h-20 w-20 rounded object-cover" />
                          <div className="flex min-w-0 flex-1 flex-col gap-1">
                            <input
                              aria-label="Caption"
                              value={photo.caption}
                              maxLength={200}
                              placeholder="caption"
                              onChange={(e) => updatePhoto(photo, { caption: e.target.value })}
                              className="rounded border border-line px-2 py-0.5 text-xs"
                            />
                            <input
                              aria-label="Light-set key"
                              value={photo.lightSetKey ?? ""}
                              maxLength={40}
                              placeholder="light set"
                              onChange={(e) => updatePhoto(photo, { lightSetKey: e.target.value || null })}
                              className="rounded border border-line px-2 py-0.5 text-xs"
                            />
                            <div className="flex gap-1">
                              <IconButton label="Move earlier" disabled={index === 0} onClick={() => movePhoto(photo, -1)}>
                                <ArrowUp className="h-3.5 w-3.5" />
                              </IconButton>
                              <IconButton label="Move later" disabled={index === slot.length - 1} onClick={() => movePhoto(photo, 1)}>
                                <ArrowDown className="h-3.5 w-3.5" />
                              </IconButton>
                              <IconButton label="Remove from the report" onClick={() => setPhotos((c) => c.filter((p) => p !== photo))}>
                                <Trash2 className="h-3.5 w-3.5" />
                              </IconButton>
                            </div>
                          </div>
                        </li>
                      ))}
                    </ul>
                  </div>
                );
              })}
            </div>
          </fieldset>
        ))}
      </Card>

      <Card className="flex flex-col gap-3">
        <h2 className="text-lg font-semibold">Write-up</h2>
        <div className="grid gap-4 lg:grid-cols-2">
          <label className="flex flex-col gap-1 text-sm">
            <span className="font-medium">Markdown (tables and lists work; HTML is shown as text)</span>
            <textarea
              name="bodyMd"
              value={bodyMd}
              maxLength={REPORT_BODY_MAX}
              rows={18}
              onChange={(e) => setBodyMd(e.target.value)}
              aria-invalid={fieldError("bodyMd") ? true : undefined}
              className="rounded-md border border-line px-3 py-2 font-mono text-xs"
            />
            <FieldError message={fieldError("bodyMd")} />
          </label>
          <div className="flex flex-col gap-1 text-sm">
            <span className="font-medium">Preview</span>
            <div data-testid="write-up-preview" className="min-h-40 rounded-md border border-dashed border-line p-3">
              <ReportMarkdown markdown={bodyMd} />
            </div>
          </div>
        </div>
      </Card>

      {failure ? (
        <div role="alert" className="rounded-lg border border-rose/40 bg-rose-soft p-3 text-sm">
          <p className="font-medium">{failure.message}</p>
          {otherFieldErrors.length > 0 ? (
            <ul className="mt-1 list-disc pl-5">
              {otherFieldErrors.map(([name, message]) => (
                <li key={name}>
                  <code>{name}</code>: {message}
                </li>
              ))}
            </ul>
          ) : null}
        </div>
      ) : null}
      {status ? <p role="status" className="text-sm text-moss">{status}</p> : null}

      <div className="flex flex-wrap gap-3">
        <Button type="submit" variant="secondary" disabled={pending}>
          Save draft
        </Button>
        <Button
          type="button"
          disabled={pending}
          onClick={() => {
            if (window.confirm(`Publish the report on “${campaign.title}”? The campaign moves to reported and every backer is e-mailed. This cannot be undone.`)) run("publish");
          }}
        >
          Publish report
        </Button>
      </div>
    </form>
  );
}

function FieldError({ message }: { message: string | undefined }) {
  return message ? <span className="text-xs text-rose">{message}</span> : null;
}

function IconButton({ label, onClick, disabled, children }: { label: string; onClick: () => void; disabled?: boolean; children: React.ReactNode }) {
  return (
    <button
      type="button"
      aria-label={label}
      title={label}
      disabled={disabled}
      onClick={onClick}
      className={cn("rounded border border-line p-1 hover:border-teal disabled:opacity-40")}
    >
      {children}
    </button>
  );
}
