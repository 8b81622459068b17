"use client";

import { useId, useState, useTransition } from "react";
import { useRouter } from "next/navigation";
import { Pencil, Plus, Trash2, Wrench } from "lucide";
import { addMaintenanceAction, createPrinterAction, removeMaintenanceAction, setPrinterStatusAction, updatePrinterAction } from "@/app/lab/printers/actions";
import { Field, inputClass } from "@/components/estimate/field";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Icon } from "@/components/ui/icon";
import { cn } from "@/lib/cn";
import { maintenanceSchema } from "@/lib/validation/lab-calendar";
import { motionTypeLabels, newPrinterSchema, printerSchema, printerStatusLabels } from "@/lib/validation/printers";
import { formNumber, formText, useActionForm } from "./action-form";
import { FormMessage, TextInput } from "./form-bits";

export type AdminPrinter = {
  id: string;
  name: string;
  model: string;
  motionType: keyof typeof motionTypeLabels;
  buildXmm: number;
  buildYmm: number;
  buildZmm: number;
  nozzleMm: number;
  maxFlowMm3PerS: number;
  enclosed: boolean;
  materials: string[];
  status: keyof typeof printerStatusLabels;
  efficiency: number;
  maintenance: { id: string; startLabel: string; endLabel: string; reason: string; ongoing: boolean }[];
};

const statusTone: Record<AdminPrinter["status"], string> = {
  available: "bg-moss-soft text-moss",
  down: "bg-rose-soft text-rose",
  maintenance: "bg-indigo-soft text-indigo",
};

export function PrinterAdmin({ printers, materials, timeZone, currency }: { printers: AdminPrinter[]; materials: readonly string[]; timeZone: string; currency: string }) {
  const [adding, setAdding] = useState(false);
  const [editing, setEditing] = useState<string | null>(null);
  const [notice, setNotice] = useState<string | null>(null);

  return (
    <div className="flex flex-col gap-4">
      <p role="status" aria-live="polite" className={cn("text-sm text-moss", !notice && "sr-only")}>
        {notice ?? ""}
      </p>
      {adding ? (
        <Card>
          <PrinterForm
            title="Add a printer"
            materials={materials}
            currency={currency}
            onCancel={() => setAdding(false)}
            onSaved={(name) => {
              setAdding(false);
              setNotice(`${name} added; the queue was recomputed.`);
            }}
          />
        </Card>
      ) : (
        <div>
          <Button onClick={() => setAdding(true)}>
            <Icon node={Plus} /> Add a printer
          </Button>
        </div>
      )}
      <ul className="flex flex-col gap-4">
        {printers.map((printer) => (
          <li key={printer.id}>
            <Card className="flex flex-col gap-4" data-testid={`printer-${printer.id}`}>
              {editing === printer.id ? (
                <PrinterForm
                  title={`Edit ${printer.name}`}
                  initial={printer}
                  materials={materials}
                  currency={currency}
                  onCancel={() => setEditing(null)}
                  onSaved={(name) => {
                    setEditing(null);
                    setNotice(`${name} saved; the queue was recomputed.`);
                  }}
                />
              ) : (
                <PrinterSummary printer={printer} onEdit={() => setEditing(printer.id)} onNotice={setNotice} />
              )}
              <MaintenanceBlocks printer={printer} timeZone={timeZone} onNotice={setNotice} />
            </Card>
          </li>
        ))}
      </ul>
    </div>
  );
}

function PrinterSummary({ printer, onEdit, onNotice }: { printer: AdminPrinter; onEdit: () => void; onNotice: (text: string) => void }) {
  const id = useId();
  const router = useRouter();
  const [pending, startTransition] = useTransition();
  const [error, setError] = useState<string | null>(null);

  function changeStatus(status: string) {
    startTransition(async () => {
      const result = await setPrinterStatusAction({ printerId: printer.id, status });
      if (result.ok) {
        setError(null);
        onNotice(`${printer.name} is now ${printerStatusLabels[result.data.status].toLowerCase()}; the queue was recomputed.`);
        router.refresh();
      } else setError(result.message);
    });
  }

  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <h2 className="text-lg font-semibold">{printer.name}</h2>
          <p className="text-sm text-muted">
            {printer.model} · {motionTypeLabels[printer.motionType]} · {printer.enclosed ? "enclosed" : "open frame"}
          </p>
        </div>
        <div className="flex flex-wrap items-center gap-2">
          <span className={cn("rounded-full px-2.5 py-0.5 text-xs font-semibold", statusTone[printer.status])}>{printerStatusLabels[printer.status]}</span>
          <label htmlFor={`${id}-status`} className="sr-only">
            Status of {printer.name}
          </label>
          <select id={`${id}-status`} value={printer.status} disabled={pending} onChange={(event) => changeStatus(event.target.value)} className="rounded-lg border border-line bg-surface px-2 py-1.5 text-sm">
            {Object.entries(printerStatusLabels).map(([value, label]) => (
              <option key={value} value={value}>
                {label}
              </option>
            ))}
          </select>
          <Button size="sm" variant="secondary" onClick={onEdit} aria-label={`Edit ${printer.name}`}>
            <Icon node={Pencil} className="h-3 w-3" /> Edit
          </Button>
        </div>
      </div>
      {error ? <p role="alert" className="text-sm text-rose">{error}</p> : null}
      <dl className="grid grid-cols-2 gap-3 text-sm sm:grid-cols-5">
        <Fact label="Build volume" value={`${printer.buildXmm} × ${printer.buildYmm} × ${printer.buildZmm} mm`} />
        <Fact label="Nozzle" value={`${printer.nozzleMm} mm`} />
        <Fact label="Max flow" value={`${printer.maxFlowMm3PerS} mm³/s`} />
        <Fact label="Efficiency" value={printer.efficiency.toFixed(3)} />
        <Fact label="Materials" value={printer.materials.join(", ")} />
      </dl>
    </div>
  );
}

function Fact({ label, value }: { label: string; value: string }) {
  return (
    <div>
      <dt className="text-xs font-medium uppercase tracking-wide text-muted">{label}</dt>
      <dd className="mt-0.5 font-medium">{value}</dd>
    </div>
  );
}

function PrinterForm({ title, initial, materials, currency, onSaved, onCancel }: {
  title: string;
  initial?: AdminPrinter;
  materials: readonly string[];
  currency: string;
  onSaved: (name: string) => void;
  onCancel: () => void;
}) {
  const uid = useId();
  const schema = initial ? printerSchema : newPrinterSchema;
  const { errors, pending, submit } = useActionForm<{ id: string }>({ schema });

  function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    const values = {
      name: formText(form, "name"),
      model: formText(form, "model"),
      motionType: formText(form, "motionType"),
      buildXmm: formNumber(form, "buildXmm"),
      buildYmm: formNumber(form, "buildYmm"),
      buildZmm: formNumber(form, "buildZmm"),
      nozzleMm: formNumber(form, "nozzleMm"),
      maxFlowMm3PerS: formNumber(form, "maxFlowMm3PerS"),
      enclosed: form.get("enclosed") === "on",
      materials: form.getAll("materials").map(String),
      status: formText(form, "status"),
      ...(initial ? {} : { hourlyRate: formNumber(form, "hourlyRate"), efficiency: formNumber(form, "efficiency") }),
    };
    submit(values, async (input) => {
      const result = initial ? await updatePrinterAction(initial.id, input) : await createPrinterAction(input);
      if (result.ok) onSaved(values.name);
      return result;
    });
  }

  return (
    <form noValidate onSubmit={onSubmit} aria-label={title} className="flex flex-col gap-4">
      <h2 className="text-lg font-semibold">{title}</h2>
      <div className="grid gap-3 sm:grid-cols-3">
        <TextInput id={`${uid}-name`} name="name" label="Name" errors={errors} defaultValue={initial?.name} hint="As the lab calls it, e.g. Bay 4 — Plover." />
        <TextInput id={`${uid}-model`} name="model" label="Model" errors={errors} defaultValue={initial?.model} hint="The lab's own model name; no real brands." />
        <Field id={`${uid}-motionType`} label="Motion type" error={errors.fields.motionType}>
          {(control) => (
            <select {...control} name="motionType" defaultValue={initial?.motionType ?? "corexy"} className={inputClass}>
              {Object.entries(motionTypeLabels).map(([value, label]) => (
                <option key={value} value={value}>
                  {label}
                </option>
              ))}
            </select>
          )}
        </Field>
      </div>
      <div className="grid gap-3 sm:grid-cols-5">
        <TextInput id={`${uid}-x`} name="buildXmm" label="Build X (mm)" numeric errors={errors} defaultValue={initial?.buildXmm} />
        <TextInput id={`${uid}-y`} name="buildYmm" label="Build Y (mm)" numeric errors={errors} defaultValue={initial?.buildYmm} />
        <TextInput id={`${uid}-z`} name="buildZmm" label="Build Z (mm)" numeric errors={errors} defaultValue={initial?.buildZmm} />
        <TextInput id={`${uid}-nozzle`} name="nozzleMm" label="Nozzle (mm)" numeric errors={errors} defaultValue={initial?.nozzleMm ?? 0.4} />
        <TextInput id={`${uid}-flow`} name="maxFlowMm3PerS" label="Max flow (mm³/s)" numeric errors={errors} defaultValue={initial?.maxFlowMm3PerS} hint="Maximum volumetric flow of the hotend." />
      </div>
      <fieldset className="flex flex-col gap-2">
        <legend className="text-sm font-medium">Materials it prints</legend>
        <div className="flex flex-wrap gap-3">
          {materials.map((material) => (
            <label key={material} className="inline-flex items-center gap-1.5 text-sm">
              <input type="checkbox" name="materials" value={material} defaultChecked={initial?.materials.includes(material) ?? material === "PLA"} />
              {material}
            </label>
          ))}
        </div>
        {errors.fields.materials ? <p className="text-xs font-medium text-rose">{errors.fields.materials}</p> : null}
      </fieldset>
      <div className="flex flex-wrap items-end gap-4">
        <label className="inline-flex items-center gap-2 text-sm font-medium">
          <input type="checkbox" name="enclosed" defaultChecked={initial?.enclosed ?? false} /> Enclosed (heated chamber, filtered)
        </label>
        <Field id={`${uid}-status`} label="Status" error={errors.fields.status}>
          {(control) => (
            <select {...control} name="status" defaultValue={initial?.status ?? "available"} className={inputClass}>
              {Object.entries(printerStatusLabels).map(([value, label]) => (
                <option key={value} value={value}>
                  {label}
                </option>
              ))}
            </select>
          )}
        </Field>
        {initial ? null : (
          <>
            <TextInput id={`${uid}-rate`} name="hourlyRate" label={`Machine rate (${currency}/h)`} numeric errors={errors} defaultValue={1.5} />
            <TextInput id={`${uid}-efficiency`} name="efficiency" label="Efficiency" numeric errors={errors} defaultValue={0.6} hint="Calibration refines it from logged runs." />
          </>
        )}
      </div>
      {initial ? <p className="text-xs text-muted">Rates, heat-up, changeover and handling minutes are edited under Settings.</p> : null}
      <FormMessage errors={errors} />
      <div className="flex gap-2">
        <Button type="submit" disabled={pending}>
          {pending ? "Saving…" : initial ? "Save printer" : "Add printer"}
        </Button>
        <Button type="button" variant="quiet" onClick={onCancel}>
          Cancel
        </Button>
      </div>
    </form>
  );
}

function MaintenanceBlocks({ printer, timeZone, onNotice }: { printer: AdminPrinter; timeZone: string; onNotice: (text: string) => void }) {
  const uid = useId();
  const router = useRouter();
  const [removing, startRemove] = useTransition();
  const { errors, pending, submit } = useActionForm<{ id: string }>({ schema: maintenanceSchema(timeZone), onDone: () => onNotice(`Maintenance block added to ${printer.name}; the queue was recomputed.`) });
  const [formKey, setFormKey] = useState(0);

  function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    submit({ printerId: printer.id, start: formText(form, "start"), end: formText(form, "end"), reason: formText(form, "reason") }, async (input) => {
      const result = await addMaintenanceAction(input);
      if (result.ok) setFormKey((key) => key + 1);
      return result;
    });
  }

  return (
    <section aria-label={`Maintenance for ${printer.name}`} className="flex flex-col gap-3 border-t border-line pt-3">
      <h3 className="flex items-center gap-2 text-sm font-semibold">
        <Icon node={Wrench} className="h-4 w-4 text-muted" /> Maintenance blocks
      </h3>
      {printer.maintenance.length === 0 ? (
        <p className="text-sm text-muted">None planned.</p>
      ) : (
        <ul className="flex flex-col gap-1 text-sm">
          {printer.maintenance.map((block) => (
            <li key={block.id} className="flex flex-wrap items-center justify-between gap-2 rounded-md bg-indigo-soft/50 px-3 py-1.5">
              <span>
                <strong className="font-medium">{block.startLabel}</strong> → {block.endLabel} · {block.reason}
                {block.ongoing ? <span className="ml-2 text-xs text-indigo">now</span> : null}
              </span>
              <Button
                size="sm"
                variant="quiet"
                disabled={removing}
                aria-label={`Remove maintenance “${block.reason}” on ${printer.name}`}
                onClick={() =>
                  startRemove(async () => {
                    const result = await removeMaintenanceAction(block.id);
                    onNotice(result.ok ? "Maintenance block removed; the queue was recomputed." : result.message);
                    router.refresh();
                  })
                }
              >
                <Icon node={Trash2} className="h-3 w-3" /> Remove
              </Button>
            </li>
          ))}
        </ul>
      )}
      <form key={formKey} noValidate onSubmit={onSubmit} aria-label={`Add maintenance to ${printer.name}`} className="grid items-start gap-3 sm:grid-cols-[1fr_1fr_2fr_auto]">
        <TextInput id={`${uid}-start`} name="start" type="datetime-local" label="From" errors={errors} />
        <TextInput id={`${uid}-end`} name="end" type="datetime-local" label="Until" errors={errors} />
        <TextInput id={`${uid}-reason`} name="reason" label="Reason" errors={errors} hint={`Times in ${timeZone}.`} />
        <Button type="submit" variant="secondary" disabled={pending} className="sm:mt-6">
          {pending ? "Adding…" : "Add block"}
        </Button>
        <div className="sm:col-span-4">
          <FormMessage errors={errors} />
        </div>
      </form>
    </section>
  );
}
