"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useId, useState, useTransition } from "react";
import { useForm } from "react-hook-form";
import { Pencil, Plus } from "lucide";
import { createTestPieceAction, setTestPieceActiveAction, updateTestPieceAction } from "@/app/lab/pieces/actions";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Icon } from "@/components/ui/icon";
import { cn } from "@/lib/cn";
import { testPieceSchema, type TestPieceFormValues, type TestPieceInput } from "@/lib/validation/test-plan";
import type { ActionResult } from "@/server/action";

export type LibraryPiece = {
  id: string;
  name: string;
  description: string;
  filamentGrams: number;
  meshUploadId: string | null;
  active: boolean;
  usedInPlans: number;
};

const inputClass = "w-full rounded-lg border border-line bg-surface px-3 py-2 text-sm aria-invalid:border-rose aria-invalid:bg-rose-soft/30";
const FIELDS = ["name", "description", "filamentGrams", "meshUploadId"] as const;

export function PieceLibrary({ pieces, canEdit }: { pieces: LibraryPiece[]; canEdit: boolean }) {
  const [editing, setEditing] = useState<string | null>(null);
  const [adding, setAdding] = useState(false);
  const [notice, setNotice] = useState<string | null>(null);
  const [pending, startTransition] = useTransition();
  const router = useRouter();

  function toggleActive(piece: LibraryPiece) {
    startTransition(async () => {
      const result = await setTestPieceActiveAction({ id: piece.id, active: !piece.active });
      setNotice(result.ok ? `${piece.name} is ${result.data.active ? "back in" : "out of"} the plan editor's picker.` : result.message);
      router.refresh();
    });
  }

  return (
    <div className="flex flex-col gap-4">
      {canEdit ? (
        adding ? (
          <Card>
            <PieceForm
              title="Add a piece"
              submitLabel="Add to the library"
              onCancel={() => setAdding(false)}
              onSave={(values) => createTestPieceAction(values)}
              onSaved={() => {
                setAdding(false);
                setNotice("Piece added.");
                router.refresh();
              }}
            />
          </Card>
        ) : (
          <div>
            <Button onClick={() => setAdding(true)}>
              <Icon node={Plus} /> Add a piece
            </Button>
          </div>
        )
      ) : (
        <p className="text-sm text-muted">Only an admin edits the library; hosts pick from it when planning a test.</p>
      )}
      <p role="status" aria-live="polite" className={cn("text-sm text-moss", !notice && "sr-only")}>
        {notice ?? ""}
      </p>
      <Card className="overflow-x-auto p-0">
        <table className="w-full min-w-[44rem] text-sm">
          <caption className="sr-only">Test pieces in the lab&apos;s library</caption>
          <thead className="border-b border-line bg-paper text-left text-muted">
            <tr>
              <th scope="col" className="px-4 py-2.5 font-medium">Piece</th>
              <th scope="col" className="px-4 py-2.5 text-right font-medium">Filament (PLA, reference scale)</th>
              <th scope="col" className="px-4 py-2.5 font-medium">Mesh upload</th>
              <th scope="col" className="px-4 py-2.5 font-medium">Status</th>
              {canEdit ? <th scope="col" className="px-4 py-2.5 font-medium"><span className="sr-only">Actions</span></th> : null}
            </tr>
          </thead>
          <tbody>
            {pieces.map((piece) =>
              editing === piece.id ? (
                <tr key={piece.id} className="border-b border-line last:border-0">
                  <td colSpan={canEdit ? 5 : 4} className="px-4 py-3">
                    <PieceForm
                      title={`Edit ${piece.name}`}
                      submitLabel="Save piece"
                      initial={piece}
                      onCancel={() => setEditing(null)}
                      onSave={(values) => updateTestPieceAction(piece.id, values)}
                      onSaved={() => {
                        setEditing(null);
                        setNotice("Saved. Published plans keep the grams they were priced with.");
                        router.refresh();
                      }}
                    />
                  </td>
                </tr>
              ) : (
                <tr key={piece.id} className={cn("border-b border-line align-top last:border-0", !piece.active && "text-muted")}>
                  <td className="px-4 py-2.5">
                    <p className="font-medium">{piece.name}</p>
                    {piece.description ? <p className="text-xs text-muted">{piece.description}</p> : null}
                  </td>
                  <td className="px-4 py-2.5 text-right font-mono">{piece.filamentGrams} g</td>
                  <td className="px-4 py-2.5 font-mono text-xs">{piece.meshUploadId ?? "—"}</td>
                  <td className="px-4 py-2.5">
                    {piece.active ? "Active" : "Deactivated"}
                    {piece.usedInPlans ? <span className="block text-xs text-muted">in {piece.usedInPlans} plan{piece.usedInPlans === 1 ? "" : "s"}</span> : null}
                  </td>
                  {canEdit ? (
                    <td className="px-4 py-2.5">
                      <div className="flex justify-end gap-2">
                        <Button size="sm" variant="secondary" onClick={() => setEditing(piece.id)} aria-label={`Edit ${piece.name}`}>
                          <Icon node={Pencil} className="h-3 w-3" /> Edit
                        </Button>
                        <Button size="sm" variant="quiet" disabled={pending} onClick={() => toggleActive(piece)} aria-label={`${piece.active ? "Deactivate" : "Reactivate"} ${piece.name}`}>
                          {piece.active ? "Deactivate" : "Reactivate"}
                        </Button>
                      </div>
                    </td>
                  ) : null}
                </tr>
              ),
            )}
          </tbody>
        </table>
      </Card>
    </div>
  );
}

function PieceForm({
  title,
  submitLabel,
  initial,
  onSave,
  onSaved,
  onCancel,
}: {
  title: string;
  submitLabel: string;
  initial?: LibraryPiece;
  onSave: (values: TestPieceInput) => Promise<ActionResult<{ id: string }>>;
  onSaved: () => void;
  onCancel: () => void;
}) {
  const uid = useId();
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<TestPieceFormValues, unknown, TestPieceInput>({
    resolver: zodResolver(testPieceSchema),
    defaultValues: {
      name: initial?.name ?? "",
      description: initial?.description ?? "",
      filamentGrams: initial?.filamentGrams,
      meshUploadId: initial?.meshUploadId ?? "",
    },
  });

  const onSubmit = handleSubmit(async (values) => {
    const result = await onSave(values);
    if (result.ok) return onSaved();
    let placed = false;
    for (const field of FIELDS) {
      const message = result.fields?.[field];
      if (message) {
        setError(field, { type: "server", message });
        placed = true;
      }
    }
    if (!placed) setError("root", { type: "server", message: result.message });
  });

  const field = (name: (typeof FIELDS)[number]) => ({
    id: `${uid}-${name}`,
    "aria-invalid": errors[name] ? true : undefined,
    "aria-describedby": errors[name] ? `${uid}-${name}-error` : undefined,
  });
  const error = (name: (typeof FIELDS)[number]) =>
    errors[name]?.message ? (
      <p id={`${uid}-${name}-error`} className="text-xs font-medium text-rose">
        {errors[name]?.message}
      </p>
    ) : null;

  return (
    <form noValidate onSubmit={(event) => void onSubmit(event)} aria-label={title} className="flex flex-col gap-3">
      <h2 className="text-lg font-semibold">{title}</h2>
      <div className="grid gap-3 sm:grid-cols-[minmax(0,2fr)_minmax(0,1fr)]">
        <div className="flex flex-col gap-1">
          <label htmlFor={`${uid}-name`} className="text-sm font-medium">Name</label>
          <input {...field("name")} className={inputClass} {...register("name")} />
          {error("name")}
        </div>
        <div className="flex flex-col gap-1">
          <label htmlFor={`${uid}-filamentGrams`} className="text-sm font-medium">Filament per print (g)</label>
          <input {...field("filamentGrams")} inputMode="decimal" className={cn(inputClass, "font-mono")} {...register("filamentGrams", { valueAsNumber: true })} />
          <p className="text-xs text-muted">PLA at reference scale; plans in other materials scale it by density.</p>
          {error("filamentGrams")}
        </div>
      </div>
      <div className="flex flex-col gap-1">
        <label htmlFor={`${uid}-description`} className="text-sm font-medium">Description</label>
        <textarea {...field("description")} rows={2} className={inputClass} {...register("description")} />
        {error("description")}
      </div>
      <div className="flex flex-col gap-1">
        <label htmlFor={`${uid}-meshUploadId`} className="text-sm font-medium">Mesh upload id (optional)</label>
        <input {...field("meshUploadId")} className={cn(inputClass, "font-mono")} {...register("meshUploadId")} />
        <p className="text-xs text-muted">The id a model upload (POST /api/uploads) answered with.</p>
        {error("meshUploadId")}
      </div>
      {errors.root?.message ? <p className="text-sm font-medium text-rose">{errors.root.message}</p> : null}
      <div className="flex gap-2">
        <Button type="submit" disabled={isSubmitting}>{isSubmitting ? "Saving…" : submitLabel}</Button>
        <Button type="button" variant="quiet" onClick={onCancel}>Cancel</Button>
      </div>
    </form>
  );
}
