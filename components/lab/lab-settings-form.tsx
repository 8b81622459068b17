"use client";

import { useActionState } from "react";
import { saveLabSettings, type SettingsFormState } from "@/app/lab/settings/actions";
import { Button } from "@/components/ui/button";
import { cn } from "@/lib/cn";

export type SettingsField = { name: string; label: string; value: string; hint?: string; suffix?: string };
export type PrinterRow = { id: string; name: string; fields: SettingsField[] };

type Props = {
  requireSafetyNote: boolean;
  general: SettingsField[];
  prices: SettingsField[];
  printers: PrinterRow[];
  currencies: readonly string[];
  currency: string;
};

export function LabSettingsForm({ requireSafetyNote, general, prices, printers, currencies, currency }: Props) {
  const [state, action, pending] = useActionState<SettingsFormState, FormData>(saveLabSettings, {});
  const value = (field: SettingsField) => state.values?.[field.name] ?? field.value;
  const input = (field: SettingsField, compact = false) => {
    const error = state.fields?.[field.name];
    const id = `f-${field.name}`;
    return (
      <div key={field.name} className="flex flex-col gap-1">
        <label htmlFor={id} className={cn("text-sm font-medium", compact && "sr-only")}>
          {field.label}
        </label>
        <div className="flex items-center gap-1.5">
          <input
            id={id}
            name={field.name}
            defaultValue={value(field)}
            inputMode="decimal"
            aria-invalid={error ? true : undefined}
            aria-describedby={error ? `${id}-error` : field.hint ? `${id}-hint` : undefined}
            className="w-full min-w-0 rounded-md border border-line bg-surface px-2.5 py-1.5 font-mono text-sm aria-invalid:border-rose"
          />
          {field.suffix ? <span className="shrink-0 text-xs text-muted">{field.suffix}</span> : null}
        </div>
        {error ? (
          <p id={`${id}-error`} className="text-xs text-rose">{error}</p>
        ) : field.hint ? (
          <p id={`${id}-hint`} className="text-xs text-muted">{field.hint}</p>
        ) : null}
      </div>
    );
  };

  return (
    <form action={action} className="flex flex-col gap-8">
      <fieldset className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
        <legend className="mb-3 text-lg font-semibold">Rates and defaults</legend>
        <div className="flex flex-col gap-1">
          <label htmlFor="f-currency" className="text-sm font-medium">Currency</label>
          <select id="f-currency" name="currency" defaultValue={state.values?.currency ?? currency} className="rounded-md border border-line bg-surface px-2.5 py-1.5 text-sm">
            {currencies.map((code) => (
              <option key={code} value={code}>{code}</option>
            ))}
          </select>
        </div>
        {general.map((field) => input(field))}
        <div className="flex items-start gap-2 sm:col-span-2 lg:col-span-3">
          <input
            id="f-requireSafetyNote"
            name="requireSafetyNote"
            type="checkbox"
            defaultChecked={state.values ? state.values.requireSafetyNote === "on" : requireSafetyNote}
            className="mt-1 h-4 w-4 accent-teal"
          />
          <label htmlFor="f-requireSafetyNote" className="text-sm">
            <span className="font-medium">Require a safety note before accepting</span>
            <span className="block text-muted">
              For material tests that heat styrenics (fumes) or print at 240 °C or hotter, a host writes down the precautions first.
            </span>
          </label>
        </div>
      </fieldset>

      <fieldset>
        <legend className="mb-3 text-lg font-semibold">Filament prices</legend>
        <div className="grid grid-cols-2 gap-4 sm:grid-cols-4 lg:grid-cols-7">{prices.map((field) => input(field))}</div>
      </fieldset>

      <fieldset>
        <legend className="mb-3 text-lg font-semibold">Printers</legend>
        <div className="overflow-x-auto">
          <table className="w-full min-w-[44rem] text-sm">
            <thead className="text-left text-muted">
              <tr>
                <th scope="col" className="py-1.5 pr-3 font-medium">Printer</th>
                {printers[0]?.fields.map((field) => (
                  <th key={field.label} scope="col" className="py-1.5 pr-3 font-medium">{field.label}</th>
                ))}
              </tr>
            </thead>
            <tbody>
              {printers.map((printer) => (
                <tr key={printer.id} className="border-t border-line align-top">
                  <th scope="row" className="py-2 pr-3 text-left font-medium">{printer.name}</th>
                  {printer.fields.map((field) => (
                    <td key={field.name} className="py-2 pr-3">{input({ ...field, label: `${printer.name}: ${field.label}` }, true)}</td>
                  ))}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </fieldset>

      <div className="flex flex-wrap items-center gap-3">
        <Button type="submit" disabled={pending}>{pending ? "Saving…" : "Save settings"}</Button>
        <p role="status" aria-live="polite" className={cn("text-sm", state.error ? "text-rose" : "text-moss")}>
          {state.error ?? (state.ok ? "Saved. New estimates use these rates." : "")}
        </p>
      </div>
    </form>
  );
}
