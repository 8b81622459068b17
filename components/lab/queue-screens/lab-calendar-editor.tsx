"use client";

import { useId, useState, useTransition } from "react";
import { useRouter } from "next/navigation";
import { Copy, RefreshCw, Trash2 } from "lucide";
import { addClosureAction, addStartWindowsAction, removeClosureAction, removeStartWindowAction, rotateFeedTokenAction } from "@/app/lab/calendar/actions";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Icon } from "@/components/ui/icon";
import { ISO_WEEKDAYS } from "@/lib/lab-calendar/local-time";
import { closureSchema, startWindowSchema } from "@/lib/validation/lab-calendar";
import { formText, useActionForm } from "./action-form";
import { FormMessage, TextInput } from "./form-bits";

export type CalendarWindow = { id: string; isoWeekday: number; label: string };
export type CalendarClosure = { id: string; startLabel: string; endLabel: string; reason: string };

function RemoveButton({ label, onRemove }: { label: string; onRemove: () => Promise<{ ok: boolean; message?: string }> }) {
  const router = useRouter();
  const [pending, startTransition] = useTransition();
  const [error, setError] = useState<string | null>(null);
  return (
    <>
      <Button
        size="sm"
        variant="quiet"
        disabled={pending}
        aria-label={label}
        onClick={() =>
          startTransition(async () => {
            const result = await onRemove();
            setError(result.ok ? null : (result.message ?? "Could not remove it."));
            router.refresh();
          })
        }
      >
        <Icon node={Trash2} className="h-3 w-3" /> Remove
      </Button>
      {error ? <span role="alert" className="text-xs text-rose">{error}</span> : null}
    </>
  );
}

export function StartWindowsEditor({ windows, canEdit }: { windows: CalendarWindow[]; canEdit: boolean }) {
  const uid = useId();
  const [formKey, setFormKey] = useState(0);
  const { errors, pending, submit } = useActionForm({ schema: startWindowSchema, onDone: () => setFormKey((key) => key + 1) });

  function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    submit({ isoWeekdays: form.getAll("isoWeekdays").map(Number), start: formText(form, "start"), end: formText(form, "end") }, addStartWindowsAction);
  }

  return (
    <Card className="flex flex-col gap-4">
      <h2 className="text-lg font-semibold">Weekly start windows</h2>
      <p className="text-sm text-muted">Hours when someone is in the lab to start a job or swap a duct. A job may run past the window; it only has to start inside one. With no windows at all, jobs may start at any hour.</p>
      <table className="w-full text-sm">
        <caption className="sr-only">Start windows by weekday</caption>
        <tbody>
          {ISO_WEEKDAYS.map(({ day, name }) => {
            const today = windows.filter((window) => window.isoWeekday === day);
            return (
              <tr key={day} className="border-b border-line last:border-0">
                <th scope="row" className="w-32 py-2 text-left font-medium">{name}</th>
                <td className="py-2">
                  {today.length === 0 ? (
                    <span className="text-muted">No one in to start jobs</span>
                  ) : (
                    <ul className="flex flex-wrap gap-2">
                      {today.map((window) => (
                        <li key={window.id} className="inline-flex items-center gap-1 rounded-md bg-teal-soft px-2 py-0.5 font-mono">
                          {window.label}
                          {canEdit ? <RemoveButton label={`Remove ${name} ${window.label}`} onRemove={() => removeStartWindowAction(window.id)} /> : null}
                        </li>
                      ))}
                    </ul>
                  )}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
      {canEdit ? (
        <form key={formKey} noValidate onSubmit={onSubmit} aria-label="Add a start window" className="flex flex-col gap-3 border-t border-line pt-3">
          <fieldset>
            <legend className="text-sm font-medium">Days</legend>
            <div className="mt-1 flex flex-wrap gap-3">
              {ISO_WEEKDAYS.map(({ day, name }) => (
                <label key={day} className="inline-flex items-center gap-1.5 text-sm">
                  <input type="checkbox" name="isoWeekdays" value={day} defaultChecked={day <= 5} /> {name}
                </label>
              ))}
            </div>
            {errors.fields.isoWeekdays ? <p className="text-xs font-medium text-rose">{errors.fields.isoWeekdays}</p> : null}
          </fieldset>
          <div className="grid items-start gap-3 sm:grid-cols-[10rem_10rem_auto]">
            <TextInput id={`${uid}-start`} name="start" type="time" label="From" errors={errors} defaultValue="08:00" />
            <TextInput id={`${uid}-end`} name="end" type="time" label="Until" errors={errors} defaultValue="18:00" hint="Before midnight; split a night shift in two." />
            <Button type="submit" variant="secondary" disabled={pending} className="justify-self-start sm:mt-6">
              {pending ? "Adding…" : "Add window"}
            </Button>
          </div>
          <FormMessage errors={errors} />
        </form>
      ) : null}
    </Card>
  );
}

export function ClosuresEditor({ closures, timeZone, canEdit }: { closures: CalendarClosure[]; timeZone: string; canEdit: boolean }) {
  const uid = useId();
  const [formKey, setFormKey] = useState(0);
  const { errors, pending, submit } = useActionForm({ schema: closureSchema(timeZone), onDone: () => setFormKey((key) => key + 1) });

  function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    submit({ start: formText(form, "start"), end: formText(form, "end"), reason: formText(form, "reason") }, addClosureAction);
  }

  return (
    <Card className="flex flex-col gap-4">
      <h2 className="text-lg font-semibold">Closures</h2>
      <p className="text-sm text-muted">Holidays and other times the lab is shut: no job starts inside one.</p>
      {closures.length === 0 ? (
        <p className="text-sm text-muted">No closures ahead.</p>
      ) : (
        <ul className="flex flex-col gap-1 text-sm">
          {closures.map((closure) => (
            <li key={closure.id} className="flex flex-wrap items-center justify-between gap-2 rounded-md bg-slate-soft px-3 py-1.5">
              <span>
                <strong className="font-medium">{closure.startLabel}</strong> → {closure.endLabel} · {closure.reason}
              </span>
              {canEdit ? <RemoveButton label={`Remove closure “${closure.reason}”`} onRemove={() => removeClosureAction(closure.id)} /> : null}
            </li>
          ))}
        </ul>
      )}
      {canEdit ? (
        <form key={formKey} noValidate onSubmit={onSubmit} aria-label="Add a closure" className="grid items-start gap-3 border-t border-line pt-3 sm:grid-cols-[1fr_1fr_2fr_auto]">
          <TextInput id={`${uid}-start`} name="start" type="datetime-local" label="From" errors={errors} />
          <TextInput id={`${uid}-end`} name="end" type="datetime-local" label="Until" errors={errors} />
          <TextInput id={`${uid}-reason`} name="reason" label="Reason" errors={errors} hint={`Times in ${timeZone}.`} />
          <Button type="submit" variant="secondary" disabled={pending} className="sm:mt-6">
            {pending ? "Adding…" : "Add closure"}
          </Button>
          <div className="sm:col-span-4">
            <FormMessage errors={errors} />
          </div>
        </form>
      ) : null}
    </Card>
  );
}

export function CalendarFeedPanel({ feedUrl, canRotate }: { feedUrl: string | null; canRotate: boolean }) {
  const router = useRouter();
  const [pending, startTransition] = useTransition();
  const [notice, setNotice] = useState<string | null>(null);

  function rotate() {
    if (feedUrl && !window.confirm("Make a new feed link? Calendars subscribed to the old link stop updating.")) return;
    startTransition(async () => {
      const result = await rotateFeedTokenAction();
      setNotice(result.ok ? "New feed link made; the old one no longer works." : result.message);
      router.refresh();
    });
  }

  return (
    <Card className="flex flex-col gap-3">
      <h2 className="text-lg font-semibold">Calendar feed</h2>
      <p className="text-sm text-muted">
        Subscribe to the queue in a calendar app (iCalendar, RFC 5545): one event per scheduled job, updated as the queue moves. The link is
        the key — anyone who has it sees printer, campaign and piece names, so share it only with the lab.
      </p>
      {feedUrl ? (
        <div className="flex flex-wrap items-center gap-2">
          <label htmlFor="feed-url" className="sr-only">
            Feed link
          </label>
          <input id="feed-url" readOnly value={feedUrl} onFocus={(event) => event.currentTarget.select()} className="min-w-0 flex-1 rounded-lg border border-line bg-paper px-3 py-2 font-mono text-xs" />
          <Button
            type="button"
            size="sm"
            variant="secondary"
            onClick={() => {
              void navigator.clipboard?.writeText(feedUrl).then(() => setNotice("Link copied."));
            }}
          >
            <Icon node={Copy} className="h-3 w-3" /> Copy
          </Button>
        </div>
      ) : (
        <p className="text-sm">No feed link yet.</p>
      )}
      {canRotate ? (
        <div>
          <Button type="button" size="sm" variant={feedUrl ? "quiet" : "primary"} disabled={pending} onClick={rotate}>
            <Icon node={RefreshCw} className="h-3 w-3" /> {feedUrl ? "Make a new link" : "Make a feed link"}
          </Button>
        </div>
      ) : null}
      <p role="status" aria-live="polite" className="text-sm text-moss">
        {notice ?? ""}
      </p>
    </Card>
  );
}
