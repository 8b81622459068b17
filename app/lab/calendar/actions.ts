"use server";

import { revalidatePath } from "next/cache";
import { getDb } from "@/db";
import { getLabSettings } from "@/db/queries/campaigns";
import { addClosure, addStartWindows, removeClosure, removeStartWindow, rotateCalendarFeedToken } from "@/db/queries/lab-calendar";
import { closureSchema, idSchema, startWindowSchema } from "@/lib/validation/lab-calendar";
import { guardedAction, parseInput } from "@/server/action";
import { refreshQueue } from "@/server/queue-refresh";

function revalidateCalendar() {
  revalidatePath("/lab/calendar");
  revalidatePath("/queue");
}

export async function addStartWindowsAction(input: unknown) {
  return guardedAction("admin", () => {
    const db = getDb();
    const added = addStartWindows(db, parseInput(startWindowSchema, input));
    refreshQueue(db, "the lab's opening hours changed");
    revalidateCalendar();
    return { ids: added.map((window) => window.id) };
  });
}

export async function removeStartWindowAction(id: unknown) {
  return guardedAction("admin", () => {
    const db = getDb();
    removeStartWindow(db, parseInput(idSchema, id));
    refreshQueue(db, "the lab's opening hours changed");
    revalidateCalendar();
    return { ok: true };
  });
}

export async function addClosureAction(input: unknown) {
  return guardedAction("admin", () => {
    const db = getDb();
    const { timeZone } = getLabSettings(db);
    const closure = addClosure(db, parseInput(closureSchema(timeZone), input), Date.now());
    refreshQueue(db, `the lab is closed: ${closure.reason}`);
    revalidateCalendar();
    return { id: closure.id };
  });
}

export async function removeClosureAction(id: unknown) {
  return guardedAction("admin", () => {
    const db = getDb();
    removeClosure(db, parseInput(idSchema, id));
    refreshQueue(db);
    revalidateCalendar();
    return { ok: true };
  });
}

/** A new feed secret; calendar apps subscribed to the old URL stop receiving the queue. */
export async function rotateFeedTokenAction() {
  return guardedAction("admin", () => {
    rotateCalendarFeedToken(getDb());
    revalidatePath("/lab/calendar");
    return { ok: true };
  });
}
