import type { Metadata } from "next";
import { CalendarFeedPanel, ClosuresEditor, StartWindowsEditor } from "@/components/lab/queue-screens/lab-calendar-editor";
import { getDb } from "@/db";
import { getLabSettings } from "@/db/queries/campaigns";
import { getCalendarFeedToken, listStartWindows, listUpcomingClosures } from "@/db/queries/lab-calendar";
import { env } from "@/lib/env";
import { formatDateTime } from "@/lib/format";
import { formatMinuteOfDay } from "@/lib/lab-calendar/local-time";
import { hasRole } from "@/lib/roles";
import { requirePageRole } from "@/server/guards";

export const metadata: Metadata = { title: "Calendar · Lab" };

export default async function LabCalendarPage() {
  const viewer = await requirePageRole("host", "/lab/calendar");
  const isAdmin = hasRole(viewer.role, "admin");
  const db = getDb();
  const { timeZone } = getLabSettings(db);
  const token = getCalendarFeedToken(db);
  const now = new Date();

  return (
    <div className="flex flex-col gap-6">
      <header className="flex flex-col gap-2">
        <h1 className="text-2xl font-bold">Lab calendar</h1>
        <p className="max-w-3xl text-muted">
          The queue starts jobs only when someone is in the lab. Times are in the lab&apos;s time zone, <strong className="text-ink">{timeZone}</strong> (it is{" "}
          {formatDateTime(now, timeZone)} there now); change the zone under Settings. Every change recomputes the queue.
          {isAdmin ? "" : " Only an admin edits the calendar."}
        </p>
      </header>
      <StartWindowsEditor
        canEdit={isAdmin}
        windows={listStartWindows(db).map((window) => ({ id: window.id, isoWeekday: window.isoWeekday, label: `${formatMinuteOfDay(window.startMinute)}–${formatMinuteOfDay(window.endMinute)}` }))}
      />
      <ClosuresEditor
        canEdit={isAdmin}
        timeZone={timeZone}
        closures={listUpcomingClosures(db, now.getTime()).map((closure) => ({
          id: closure.id,
          startLabel: formatDateTime(closure.startsAt, timeZone),
          endLabel: formatDateTime(closure.endsAt, timeZone),
          reason: closure.reason,
        }))}
      />
      <CalendarFeedPanel canRotate={isAdmin} feedUrl={token ? `${env.appUrl}/api/queue/calendar.ics?token=${encodeURIComponent(token)}` : null} />
    </div>
  );
}
