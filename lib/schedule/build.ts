import { expandStartWindows } from "./calendar";
import { estimatedHours, fitsBuildVolume, ineligibility, materialKey } from "./eligibility";
import { mergeIntervals } from "./intervals";
import { compareIds, comparePriority, comparePriorityClass } from "./priority";
import { earliestSlot } from "./slot";
import type { Interval, Placement, Schedule, ScheduleInput, ScheduleJob, SchedulePrinter, Unplaced } from "./types";

export const DEFAULT_HORIZON_DAYS = 365;
const MINUTE = 60_000;
const HOUR = 3_600_000;
const DAY = 86_400_000;

type PrinterState = {
  printer: SchedulePrinter;
  materials: Set<string>;
  maintenance: Interval[];
  /** When the last job placed on it ends (never before now). */
  freeAt: number;
  /** Variant and material it is set up for; null when unknown (the first job counts a changeover). */
  setup: string | null;
};

type Candidate = {
  job: ScheduleJob;
  setup: string;
  eligible: PrinterState[];
  /** Estimated print time on each eligible printer, same order. */
  durationsMs: number[];
  /** Shortest estimate over its eligible printers: the size LPT sorts by. */
  sortHours: number;
  done: boolean;
};

type Option = { state: PrinterState; changeoverStart: number; start: number; end: number; changeover: boolean };

export function setupKey(variantKey: string, material: string): string {
  return `${variantKey}\u0000${materialKey(material)}`;
}

/**
 * Greedy list scheduling. Running jobs stay where they are. The rest are taken in priority
 * classes (pins, host order, funded date — see comparePriorityClass), a class only once the
 * class before it is placed, so no job ever waits behind a lower-priority one on its printer.
 * Inside a class, longest job first (LPT), each to the printer where it would finish earliest
 * (changeover included; ties: no changeover, then printer id). When that printer would need a
 * changeover and the class still holds a job for its current set-up that also finishes
 * earliest there, that job goes first — so same-variant jobs stay together.
 */
export function buildSchedule(input: ScheduleInput): Schedule {
  const { now } = input;
  const horizonEnd = now + (input.horizonDays ?? DEFAULT_HORIZON_DAYS) * DAY;
  const windows = expandStartWindows(input.calendar, now, horizonEnd);
  const printers = [...input.printers].sort((a, b) => compareIds(a.id, b.id));
  const states = new Map<string, PrinterState>(
    printers.map((printer) => [
      printer.id,
      {
        printer,
        materials: new Set(printer.materials.map(materialKey)),
        maintenance: mergeIntervals(printer.maintenance),
        freeAt: now,
        setup: printer.setup ? setupKey(printer.setup.variantKey, printer.setup.material) : null,
      },
    ]),
  );
  const placements: Placement[] = [];
  const unplaced: Unplaced[] = [];

  const running = input.jobs.filter((job) => job.running).sort((a, b) => (a.running?.start ?? 0) - (b.running?.start ?? 0) || compareIds(a.id, b.id));
  for (const job of running) {
    const { printerId, start } = job.running as { printerId: string; start: number };
    const hours = estimatedHours(job, printerId) ?? 0;
    // A job past its estimate is still on the printer: take it to end now.
    const end = Math.max(start + hours * HOUR, now);
    placements.push({ jobId: job.id, printerId, changeoverStart: start, start, end, changeover: false });
    const state = states.get(printerId);
    if (state) {
      state.freeAt = Math.max(state.freeAt, end);
      state.setup = setupKey(job.variantKey, job.material);
    }
  }

  const waiting: Candidate[] = [];
  for (const job of input.jobs.filter((job) => !job.running).sort(comparePriority)) {
    const candidate = prepare(job, printers, states);
    if ("reason" in candidate) unplaced.push(candidate);
    else waiting.push(candidate);
  }

  const optionOn = (candidate: Candidate, state: PrinterState): Option | null => {
    const changeoverMs = state.printer.changeoverMinutes > 0 && state.setup !== candidate.setup ? state.printer.changeoverMinutes * MINUTE : 0;
    const duration = candidate.durationsMs[candidate.eligible.indexOf(state)] as number;
    const begin = earliestSlot(windows, state.maintenance, state.freeAt, changeoverMs, duration);
    if (begin === null) return null;
    return { state, changeoverStart: begin, start: begin + changeoverMs, end: begin + changeoverMs + duration, changeover: changeoverMs > 0 };
  };
  const bestOption = (candidate: Candidate): Option | null => {
    let best: Option | null = null;
    for (const state of candidate.eligible) {
      const option = optionOn(candidate, state);
      if (option && (!best || option.end < best.end || (option.end === best.end && best.changeover && !option.changeover))) best = option;
    }
    return best;
  };
  const place = (candidate: Candidate, option: Option) => {
    candidate.done = true;
    option.state.freeAt = option.end;
    option.state.setup = candidate.setup;
    placements.push({
      jobId: candidate.job.id,
      printerId: option.state.printer.id,
      changeoverStart: option.changeoverStart,
      start: option.start,
      end: option.end,
      changeover: option.changeover,
    });
  };

  for (let from = 0; from < waiting.length; ) {
    let to = from + 1;
    while (to < waiting.length && comparePriorityClass((waiting[from] as Candidate).job, (waiting[to] as Candidate).job) === 0) to++;
    scheduleClass(waiting.slice(from, to));
    from = to;
  }

  function scheduleClass(members: Candidate[]) {
    const queue = members.sort((a, b) => b.sortHours - a.sortHours || compareIds(a.setup, b.setup) || compareIds(a.job.id, b.job.id));
    const bySetup = new Map<string, Candidate[]>();
    for (const candidate of queue) {
      const group = bySetup.get(candidate.setup) ?? [];
      group.push(candidate);
      bySetup.set(candidate.setup, group);
    }
    // A placed job stays placed, so a cursor per list that only moves past placed ones finds the
    // first job left in amortised constant time.
    const cursors = new Map<Candidate[], number>();
    const firstLeft = (list: Candidate[]) => {
      let index = cursors.get(list) ?? 0;
      while (index < list.length && (list[index] as Candidate).done) index++;
      cursors.set(list, index);
      return list[index];
    };
    for (let head = firstLeft(queue); head; head = firstLeft(queue)) {
      const option = bestOption(head);
      if (!option) {
        head.done = true;
        unplaced.push({ jobId: head.job.id, reason: "beyond_horizon", message: beyondHorizonMessage(windows.length, input.horizonDays ?? DEFAULT_HORIZON_DAYS) });
        continue;
      }
      const currentSetup = option.state.setup;
      if (option.changeover && currentSetup !== null) {
        const group = bySetup.get(currentSetup);
        const sameSetup = group && firstLeft(group);
        if (sameSetup && sameSetup.eligible.includes(option.state)) {
          const here = optionOn(sameSetup, option.state);
          const best = bestOption(sameSetup);
          if (here && best && here.end <= best.end) {
            place(sameSetup, here);
            continue;
          }
        }
      }
      place(head, option);
    }
  }

  placements.sort((a, b) => a.start - b.start || compareIds(a.printerId, b.printerId) || compareIds(a.jobId, b.jobId));
  const jobsById = new Map(input.jobs.map((job) => [job.id, job]));
  unplaced.sort((a, b) => comparePriority(jobsById.get(a.jobId) as ScheduleJob, jobsById.get(b.jobId) as ScheduleJob));
  return { placements, unplaced };
}

function prepare(job: ScheduleJob, printers: SchedulePrinter[], states: Map<string, PrinterState>): Candidate | Unplaced {
  const setup = setupKey(job.variantKey, job.material);
  if (job.printerId !== null) {
    const chosen = states.get(job.printerId);
    if (!chosen) return { jobId: job.id, reason: "chosen_printer_ineligible", message: "The chosen printer is not in the lab." };
    const why = ineligibility(job, chosen.printer);
    if (why) return { jobId: job.id, reason: "chosen_printer_ineligible", message: `The chosen printer cannot take it: ${why.message}` };
    const hours = estimatedHours(job, chosen.printer.id) as number;
    return { job, setup, eligible: [chosen], durationsMs: [hours * HOUR], sortHours: hours, done: false };
  }
  // The same rules as ineligibility(), without building messages for the common case.
  const material = materialKey(job.material);
  const eligible: PrinterState[] = [];
  const durationsMs: number[] = [];
  let sortHours = Infinity;
  for (const printer of printers) {
    const state = states.get(printer.id) as PrinterState;
    if (!printer.available || !state.materials.has(material) || (job.needsEnclosure && !printer.enclosed) || !fitsBuildVolume(job.sizeMm, printer.buildMm)) continue;
    const hours = estimatedHours(job, printer.id);
    if (hours === undefined) continue;
    eligible.push(state);
    durationsMs.push(hours * HOUR);
    sortHours = Math.min(sortHours, hours);
  }
  if (eligible.length === 0) {
    const reasons = printers.map((printer) => `${printer.id}: ${ineligibility(job, printer)?.message ?? ""}`);
    const detail = reasons.length ? ` (${reasons.join(" ")})` : " (the lab has no printers)";
    return { jobId: job.id, reason: "no_eligible_printer", message: `No printer can take this job${detail}.` };
  }
  return { job, setup, eligible, durationsMs, sortHours, done: false };
}

function beyondHorizonMessage(windowCount: number, horizonDays: number): string {
  if (windowCount === 0) return `The lab calendar has no start window in the next ${horizonDays} days.`;
  return `No start window on an eligible printer leaves room for it (clear of maintenance) in the next ${horizonDays} days.`;
}
