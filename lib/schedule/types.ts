/**
 * The scheduling contract shared by the queue's database side, its recompute service and the
 * host screens. Everything here is plain data: UTC milliseconds, minutes and hours as numbers.
 */

/** Half-open [start, end) in UTC milliseconds. */
export type Interval = { start: number; end: number };

/** Hours when someone is in the lab to start or change a job, in the lab's local time. isoWeekday 1 = Monday … 7 = Sunday; minutes from local midnight; endMinute > startMinute, ≤ 1440. */
export type WeeklyWindow = { isoWeekday: 1 | 2 | 3 | 4 | 5 | 6 | 7; startMinute: number; endMinute: number };

/**
 * The lab's calendar. An empty `startWindows` list means "no staffing restriction": jobs may
 * start at any instant (closures still apply).
 */
export type LabCalendar = { timeZone: string; startWindows: WeeklyWindow[]; closures: Interval[] };

export type SizeMm = { x: number; y: number; z: number };

export type SchedulePrinter = {
  id: string;
  /** false when down or in maintenance status: nothing new is placed on it. */
  available: boolean;
  materials: string[];
  enclosed: boolean;
  buildMm: SizeMm;
  changeoverMinutes: number;
  maintenance: Interval[];
  /** What it is set up for now (the last job printed), when known; unknown means the first job placed on it counts a changeover. Ignored when a job is running on it. */
  setup?: { variantKey: string; material: string } | null;
};

export type ScheduleJob = {
  id: string;
  campaignId: string;
  /** Jobs with the same key use the same part under test; switching key (or material) on a printer costs a changeover. */
  variantKey: string;
  material: string;
  needsEnclosure: boolean;
  sizeMm: SizeMm;
  /** Estimated (calibrated) hours on each printer that has an estimate. */
  hoursByPrinter: Record<string, number>;
  fundedAt: number;
  /** Host pins come first, then host order (position ascending, nulls last), then funded date, then id. */
  pinned: boolean;
  position: number | null;
  /** Host's choice of printer, kept if eligible; otherwise the job is unplaced with a reason. */
  printerId: string | null;
  /** Already printing: fixed on this printer from this start for its estimated hours. */
  running?: { printerId: string; start: number };
};

export type ScheduleInput = {
  now: number;
  calendar: LabCalendar;
  printers: SchedulePrinter[];
  jobs: ScheduleJob[];
  /** How far ahead jobs may be placed (start of the changeover), from `now`. Default DEFAULT_HORIZON_DAYS. */
  horizonDays?: number;
};

export type Placement = {
  jobId: string;
  printerId: string;
  /** = start when no changeover */
  changeoverStart: number;
  start: number;
  end: number;
  changeover: boolean;
};

export type UnplacedReason = "no_eligible_printer" | "chosen_printer_ineligible" | "beyond_horizon";
export type Unplaced = { jobId: string; reason: UnplacedReason; message: string };
export type Schedule = { placements: Placement[]; unplaced: Unplaced[] };

export type IneligibilityCode = "printer_unavailable" | "material" | "enclosure" | "build_volume" | "no_estimate";
export type Ineligibility = { code: IneligibilityCode; message: string };

export type PlacementCheck = { ok: true } | { ok: false; code: "ineligible" | "maintenance" | "outside_window"; message: string };

export type CalibrationRun = { estimatedHours: number; actualHours: number };
export type EfficiencyFit = {
  /** k in actual ≈ k·estimated (1 when too few runs to fit). */
  factor: number;
  /** The printer's efficiency after the fit: current / k, clamped. */
  efficiency: number;
  /** Runs used in the fit (those with positive, finite hours). */
  runs: number;
  /** Coefficient of determination, 1 − SSres/SStot with SStot about the mean actual hours; null when not fitted. */
  r2: number | null;
};

/** Jobs without windows or changeovers, for lowerBound: only their durations matter. */
export type DurationJob = { hours: number } | number;
