import { sql } from "drizzle-orm";
import {
  type AnySQLiteColumn,
  check,
  index,
  integer,
  primaryKey,
  real,
  sqliteTable,
  text,
  uniqueIndex,
} from "drizzle-orm/sqlite-core";
import type { FanFlowRating, OpeningShape } from "../lib/estimate/duct";

/*
 * Conventions: ids are text UUIDs; timestamps are integer milliseconds since the epoch (UTC);
 * money is an integer count of minor units beside an ISO 4217 currency code.
 */

const id = () =>
  text("id")
    .primaryKey()
    .$defaultFn(() => crypto.randomUUID());
const createdAt = () =>
  integer("created_at", { mode: "timestamp_ms" })
    .notNull()
    .$defaultFn(() => new Date());
const updatedAt = () =>
  integer("updated_at", { mode: "timestamp_ms" })
    .notNull()
    .$defaultFn(() => new Date())
    .$onUpdateFn(() => new Date());

export const storedRoles = ["supporter", "host", "admin"] as const;
export const proposalStates = ["draft", "submitted", "accepted", "declined", "merged"] as const;
export const proposalKinds = ["duct", "material", "nozzle", "part"] as const;
export const campaignStates = ["open", "funded", "lapsed", "withdrawn", "queued", "printing", "reported"] as const;
export const pledgeStates = ["pending", "paid", "refunded", "failed"] as const;
export const membershipStatuses = ["active", "past_due", "canceled"] as const;
export const printerStatuses = ["available", "down", "maintenance"] as const;
export const motionTypes = ["corexy", "bedslinger", "delta"] as const;
export const jobStates = ["planned", "scheduled", "running", "done", "failed"] as const;
export const ledgerKinds = [
  "pledge_payment",
  "pledge_refund",
  "membership_payment",
  "fund_allocation",
  "fund_release",
  "processor_fee",
] as const;
/** `suppressed`: not sent because the recipient turned that kind of mail off. */
export const outboxStates = ["queued", "sending", "sent", "failed", "suppressed"] as const;
export const reportStates = ["draft", "published"] as const;
export const reportCostSources = ["run_log", "entered"] as const;
export const uploadKinds = ["model", "photo"] as const;

/* ---------- Auth.js tables (names and columns as the Drizzle adapter expects) ---------- */

export const users = sqliteTable("user", {
  id: id(),
  name: text("name"),
  email: text("email").unique(),
  emailVerified: integer("emailVerified", { mode: "timestamp_ms" }),
  image: text("image"),
  /** Stored role; "member" is not stored but derived from an active Filament Club membership. */
  role: text("role", { enum: storedRoles }).notNull().default("supporter"),
  createdAt: createdAt(),
});

export const accounts = sqliteTable(
  "account",
  {
    userId: text("userId")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    type: text("type").notNull(),
    provider: text("provider").notNull(),
    providerAccountId: text("providerAccountId").notNull(),
    refresh_token: text("refresh_token"),
    access_token: text("access_token"),
    expires_at: integer("expires_at"),
    token_type: text("token_type"),
    scope: text("scope"),
    id_token: text("id_token"),
    session_state: text("session_state"),
  },
  (t) => [primaryKey({ columns: [t.provider, t.providerAccountId] })],
);

export const sessions = sqliteTable(
  "session",
  {
    sessionToken: text("sessionToken").primaryKey(),
    userId: text("userId")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    expires: integer("expires", { mode: "timestamp_ms" }).notNull(),
  },
  (t) => [index("session_user_idx").on(t.userId)],
);

export const verificationTokens = sqliteTable(
  "verificationToken",
  {
    identifier: text("identifier").notNull(),
    token: text("token").notNull(),
    expires: integer("expires", { mode: "timestamp_ms" }).notNull(),
  },
  (t) => [primaryKey({ columns: [t.identifier, t.token] })],
);

/* ---------- Lab ---------- */

/** One row (id = 1): the lab's rates and defaults, edited by an admin. */
export const labSettings = sqliteTable(
  "lab_settings",
  {
    id: integer("id").primaryKey(),
    labName: text("lab_name").notNull(),
    currency: text("currency").notNull(),
    timeZone: text("time_zone").notNull(),
    labourRateMinorPerHour: integer("labour_rate_minor_per_hour").notNull(),
    feeBasisPoints: integer("fee_basis_points").notNull(),
    feeFixedMinor: integer("fee_fixed_minor").notNull(),
    contingencyPercent: integer("contingency_percent").notNull(),
    reportPrepHours: integer("report_prep_hours").notNull(),
    /** Hands-on hours per test plan beyond printing: measuring, photographing, writing up. */
    planLabourHours: real("plan_labour_hours").notNull().default(3),
    /** When set, a host must write a safety note before accepting a proposal that needs one. */
    requireSafetyNote: integer("require_safety_note", { mode: "boolean" }).notNull().default(true),
    /** Print queue: backers are mailed when their results date moves more than this many days past the date they were last told. */
    slipNoticeDays: integer("slip_notice_days").notNull().default(2),
    /** Secret in the host calendar feed's URL (/api/queue/calendar.ics?token=…); null until an admin creates one. */
    calendarFeedToken: text("calendar_feed_token"),
    updatedAt: updatedAt(),
  },
  (t) => [check("lab_settings_single_row", sql`${t.id} = 1`)],
);

export const printers = sqliteTable("printer", {
  id: id(),
  slug: text("slug").notNull().unique(),
  name: text("name").notNull(),
  model: text("model").notNull(),
  motionType: text("motion_type", { enum: motionTypes }).notNull(),
  buildXmm: integer("build_x_mm").notNull(),
  buildYmm: integer("build_y_mm").notNull(),
  buildZmm: integer("build_z_mm").notNull(),
  nozzleMm: real("nozzle_mm").notNull(),
  maxFlowMm3PerS: real("max_flow_mm3_per_s").notNull(),
  /** Fraction of the maximum flow achieved on average (acceleration, travel, slow features). */
  efficiency: real("efficiency").notNull(),
  enclosed: integer("enclosed", { mode: "boolean" }).notNull(),
  /** JSON array of material codes, e.g. ["PLA","PETG"]. */
  materials: text("materials", { mode: "json" }).$type<string[]>().notNull(),
  hourlyRateMinor: integer("hourly_rate_minor").notNull(),
  heatUpMinutes: real("heat_up_minutes").notNull().default(6),
  /** Swapping the part under test (e.g. a duct) between variants. */
  changeoverMinutes: real("changeover_minutes").notNull().default(15),
  /** Clearing the bed, removing and labelling the print. */
  handlingMinutesPerJob: real("handling_minutes_per_job").notNull().default(4),
  status: text("status", { enum: printerStatuses }).notNull().default("available"),
  createdAt: createdAt(),
});

/** What the lab pays per kilogram of each material, in the lab's currency. */
export const filamentPrices = sqliteTable("filament_price", {
  material: text("material").primaryKey(),
  pricePerKgMinor: integer("price_per_kg_minor").notNull(),
  updatedAt: updatedAt(),
});

/* ---------- Proposals ---------- */

export const proposals = sqliteTable(
  "proposal",
  {
    id: id(),
    slug: text("slug").notNull().unique(),
    title: text("title").notNull(),
    kind: text("kind", { enum: proposalKinds }).notNull(),
    printerType: text("printer_type", { enum: motionTypes }).notNull(),
    why: text("why").notNull(),
    descriptionMd: text("description_md").notNull().default(""),
    /** The material a material proposal heats; drives the safety cautions. */
    material: text("material"),
    /** Duct proposals: the duct helper's inputs (inlet, outlets, fan). */
    ductDetails: text("duct_details", { mode: "json" }).$type<DuctDetails>(),
    /** Written by the lab before accepting a proposal whose material needs cautions. */
    safetyNote: text("safety_note"),
    state: text("state", { enum: proposalStates }).notNull().default("draft"),
    /** Votes cast on it, recomputed from proposal_vote in the same transaction as every vote change. */
    voteCount: integer("vote_count").notNull().default(0),
    /** Set when a host starts reviewing it; from then on the proposer can no longer edit it. */
    reviewStartedAt: integer("review_started_at", { mode: "timestamp_ms" }),
    decidedAt: integer("decided_at", { mode: "timestamp_ms" }),
    proposerId: text("proposer_id")
      .notNull()
      .references(() => users.id),
    mergedIntoId: text("merged_into_id").references((): AnySQLiteColumn => proposals.id),
    declineReason: text("decline_reason"),
    submittedAt: integer("submitted_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    index("proposal_state_idx").on(t.state, t.createdAt),
    index("proposal_votes_idx").on(t.state, t.voteCount),
    index("proposal_proposer_idx").on(t.proposerId),
  ],
);

export const proposalFollowers = sqliteTable(
  "proposal_follower",
  {
    proposalId: text("proposal_id")
      .notNull()
      .references(() => proposals.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    createdAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.proposalId, t.userId] })],
);

export const proposalVotes = sqliteTable(
  "proposal_vote",
  {
    proposalId: text("proposal_id")
      .notNull()
      .references(() => proposals.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    createdAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.proposalId, t.userId] }), index("proposal_vote_user_idx").on(t.userId, t.createdAt)],
);

/* ---------- Campaigns and test plans ---------- */

/** The lab's library of test pieces, managed by admins; plans pick from it. */
export const testPieces = sqliteTable("test_piece", {
  id: id(),
  slug: text("slug").notNull().unique(),
  name: text("name").notNull(),
  description: text("description").notNull().default(""),
  /** Filament for one print at reference scale in PLA (volume follows from the density). */
  filamentGrams: real("filament_grams").notNull(),
  meshUploadId: text("mesh_upload_id").references(() => uploads.id, { onDelete: "set null" }),
  active: integer("active", { mode: "boolean" }).notNull().default(true),
  position: integer("position").notNull().default(0),
  createdAt: createdAt(),
});

export const campaigns = sqliteTable(
  "campaign",
  {
    id: id(),
    slug: text("slug").notNull().unique(),
    proposalId: text("proposal_id").references(() => proposals.id),
    title: text("title").notNull(),
    summary: text("summary").notNull(),
    state: text("state", { enum: campaignStates }).notNull().default("open"),
    goalMinor: integer("goal_minor").notNull(),
    currency: text("currency").notNull(),
    /** Reason shown to backers when the host overrides the computed goal. */
    goalOverrideReason: text("goal_override_reason"),
    deadline: integer("deadline", { mode: "timestamp_ms" }).notNull(),
    openedAt: integer("opened_at", { mode: "timestamp_ms" }).notNull(),
    fundedAt: integer("funded_at", { mode: "timestamp_ms" }),
    closedAt: integer("closed_at", { mode: "timestamp_ms" }),
    withdrawReason: text("withdraw_reason"),
    hostId: text("host_id").references(() => users.id),
    /** Print queue: last job's end plus report preparation, from the latest schedule; null while any job is unplaced. */
    estimatedResultsAt: integer("estimated_results_at", { mode: "timestamp_ms" }),
    /** When backers were first told the campaign's date ("scheduled" mail). */
    scheduledNotifiedAt: integer("scheduled_notified_at", { mode: "timestamp_ms" }),
    /** The results date backers were last told; slip mails compare against it. */
    lastNotifiedResultsAt: integer("last_notified_results_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
  },
  (t) => [index("campaign_state_idx").on(t.state, t.deadline), check("campaign_goal_positive", sql`${t.goalMinor} > 0`)],
);

export const testPlans = sqliteTable("test_plan", {
  id: id(),
  campaignId: text("campaign_id")
    .notNull()
    .unique()
    .references(() => campaigns.id, { onDelete: "cascade" }),
  material: text("material").notNull(),
  layerHeightMm: real("layer_height_mm").notNull(),
  maxFlowMm3PerS: real("max_flow_mm3_per_s").notNull(),
  fanPercent: integer("fan_percent").notNull(),
  repeats: integer("repeats").notNull(),
  printerId: text("printer_id").references(() => printers.id),
  estimatedHours: real("estimated_hours"),
  notesMd: text("notes_md").notNull().default(""),
});

export const testPlanPieces = sqliteTable("test_plan_piece", {
  id: id(),
  testPlanId: text("test_plan_id")
    .notNull()
    .references(() => testPlans.id, { onDelete: "cascade" }),
  name: text("name").notNull(),
  filamentGrams: real("filament_grams").notNull(),
  libraryPieceId: text("library_piece_id").references(() => testPieces.id, { onDelete: "set null" }),
  position: integer("position").notNull(),
});

export const testPlanVariants = sqliteTable("test_plan_variant", {
  id: id(),
  testPlanId: text("test_plan_id")
    .notNull()
    .references(() => testPlans.id, { onDelete: "cascade" }),
  name: text("name").notNull(),
  isReference: integer("is_reference", { mode: "boolean" }).notNull().default(false),
  position: integer("position").notNull(),
});

export const jobs = sqliteTable(
  "job",
  {
    id: id(),
    campaignId: text("campaign_id")
      .notNull()
      .references(() => campaigns.id, { onDelete: "cascade" }),
    pieceId: text("piece_id")
      .notNull()
      .references(() => testPlanPieces.id, { onDelete: "cascade" }),
    variantId: text("variant_id")
      .notNull()
      .references(() => testPlanVariants.id, { onDelete: "cascade" }),
    repeat: integer("repeat").notNull(),
    printerId: text("printer_id").references(() => printers.id),
    state: text("state", { enum: jobStates }).notNull().default("planned"),
    estimatedHours: real("estimated_hours").notNull(),
    scheduledStart: integer("scheduled_start", { mode: "timestamp_ms" }),
    /* Print queue: the host's controls and the scheduler's placement (printerId is the scheduled printer). */
    pinned: integer("pinned", { mode: "boolean" }).notNull().default(false),
    /** Host order; null sorts after every positioned job, then by funded date. */
    position: integer("position"),
    chosenPrinterId: text("chosen_printer_id").references(() => printers.id, { onDelete: "set null" }),
    /** Start of the changeover before this job; equals scheduledStart when there is none. */
    scheduledChangeoverStart: integer("scheduled_changeover_start", { mode: "timestamp_ms" }),
    scheduledEnd: integer("scheduled_end", { mode: "timestamp_ms" }),
    /** Why the scheduler could not place the job (shown to hosts); null when placed. */
    unplacedReason: text("unplaced_reason"),
    /** Bounding box of the printed piece when known (from its measured mesh); null fits any printer. */
    sizeXmm: real("size_x_mm"),
    sizeYmm: real("size_y_mm"),
    sizeZmm: real("size_z_mm"),
    actualHours: real("actual_hours"),
    filamentUsedGrams: real("filament_used_grams"),
    notes: text("notes"),
  },
  (t) => [
    uniqueIndex("job_identity_idx").on(t.campaignId, t.pieceId, t.variantId, t.repeat),
    index("job_printer_idx").on(t.printerId, t.state),
    index("job_state_idx").on(t.state, t.campaignId),
  ],
);

/* ---------- Lab calendar, maintenance and the run log ---------- */

export const runOutcomes = ["done", "failed"] as const;

/** Hours when someone is in the lab to start or change a job, in the lab's local time (lab_settings.time_zone). */
export const labStartWindows = sqliteTable(
  "lab_start_window",
  {
    id: id(),
    /** 1 = Monday … 7 = Sunday (ISO 8601). */
    isoWeekday: integer("iso_weekday").notNull(),
    /** Minutes from local midnight; the window is [start, end). */
    startMinute: integer("start_minute").notNull(),
    endMinute: integer("end_minute").notNull(),
    createdAt: createdAt(),
  },
  (t) => [
    index("lab_start_window_day_idx").on(t.isoWeekday, t.startMinute),
    check("lab_start_window_day", sql`${t.isoWeekday} between 1 and 7`),
    check("lab_start_window_minutes", sql`${t.startMinute} >= 0 and ${t.endMinute} > ${t.startMinute} and ${t.endMinute} <= 1440`),
  ],
);

/** Days or hours the lab is shut (holidays, a move); nothing starts inside one. */
export const labClosures = sqliteTable(
  "lab_closure",
  {
    id: id(),
    startsAt: integer("starts_at", { mode: "timestamp_ms" }).notNull(),
    endsAt: integer("ends_at", { mode: "timestamp_ms" }).notNull(),
    reason: text("reason").notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("lab_closure_start_idx").on(t.startsAt), check("lab_closure_order", sql`${t.endsAt} > ${t.startsAt}`)],
);

/** A printer out of use for a while (nozzle swap, belt tension); no job may overlap it. */
export const printerMaintenance = sqliteTable(
  "printer_maintenance",
  {
    id: id(),
    printerId: text("printer_id")
      .notNull()
      .references(() => printers.id, { onDelete: "cascade" }),
    startsAt: integer("starts_at", { mode: "timestamp_ms" }).notNull(),
    endsAt: integer("ends_at", { mode: "timestamp_ms" }).notNull(),
    reason: text("reason").notNull(),
    createdAt: createdAt(),
  },
  (t) => [
    index("printer_maintenance_printer_idx").on(t.printerId, t.startsAt),
    check("printer_maintenance_order", sql`${t.endsAt} > ${t.startsAt}`),
  ],
);

/**
 * One attempt at printing a job. A run is started (outcome null) and finished once; a failed run
 * sends the job back to the queue and the next start is attempt + 1. (jobId, attempt) is unique
 * and at most one run per job is open, so a double click or a retried request cannot log twice.
 */
export const jobRuns = sqliteTable(
  "job_run",
  {
    id: id(),
    jobId: text("job_id")
      .notNull()
      .references(() => jobs.id, { onDelete: "cascade" }),
    attempt: integer("attempt").notNull(),
    printerId: text("printer_id")
      .notNull()
      .references(() => printers.id),
    startedAt: integer("started_at", { mode: "timestamp_ms" }).notNull(),
    finishedAt: integer("finished_at", { mode: "timestamp_ms" }),
    /** The job's estimate when it started, and the printer's efficiency behind it (calibration rescales by it). */
    estimatedHoursAtStart: real("estimated_hours_at_start").notNull(),
    efficiencyAtStart: real("efficiency_at_start").notNull(),
    actualHours: real("actual_hours"),
    filamentUsedGrams: real("filament_used_grams"),
    outcome: text("outcome", { enum: runOutcomes }),
    failureReason: text("failure_reason"),
    notes: text("notes"),
    startedById: text("started_by_id").references(() => users.id),
    finishedById: text("finished_by_id").references(() => users.id),
  },
  (t) => [
    uniqueIndex("job_run_attempt_idx").on(t.jobId, t.attempt),
    uniqueIndex("job_run_one_open_idx")
      .on(t.jobId)
      .where(sql`${t.outcome} is null`),
    index("job_run_printer_idx").on(t.printerId, t.outcome),
    check("job_run_failure_reason", sql`${t.outcome} is not 'failed' or ${t.failureReason} is not null`),
  ],
);

/* ---------- Money ---------- */

export const pledges = sqliteTable(
  "pledge",
  {
    id: id(),
    campaignId: text("campaign_id")
      .notNull()
      .references(() => campaigns.id),
    supporterId: text("supporter_id")
      .notNull()
      .references(() => users.id),
    amountMinor: integer("amount_minor").notNull(),
    currency: text("currency").notNull(),
    state: text("state", { enum: pledgeStates }).notNull().default("pending"),
    /** Shown on the campaign page only when the backer allows it. */
    publicName: text("public_name"),
    checkoutSessionId: text("checkout_session_id").unique(),
    paymentIntentId: text("payment_intent_id").unique(),
    refundId: text("refund_id").unique(),
    createdAt: createdAt(),
    paidAt: integer("paid_at", { mode: "timestamp_ms" }),
    refundedAt: integer("refunded_at", { mode: "timestamp_ms" }),
  },
  (t) => [
    // Covers the goal check's sum of paid pledges, run on every payment.
    index("pledge_campaign_idx").on(t.campaignId, t.state, t.amountMinor),
    index("pledge_supporter_idx").on(t.supporterId),
    check("pledge_amount_positive", sql`${t.amountMinor} > 0`),
  ],
);

export const membershipPlans = sqliteTable("membership_plan", {
  code: text("code", { enum: ["spool", "reel", "workshop"] }).primaryKey(),
  name: text("name").notNull(),
  monthlyMinor: integer("monthly_minor").notNull(),
  currency: text("currency").notNull(),
  monthlyVotes: integer("monthly_votes").notNull(),
  earlyBlindPairs: integer("early_blind_pairs", { mode: "boolean" }).notNull(),
  stripePriceId: text("stripe_price_id"),
  position: integer("position").notNull(),
});

export const memberships = sqliteTable(
  "membership",
  {
    id: id(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id),
    planCode: text("plan_code")
      .notNull()
      .references(() => membershipPlans.code),
    status: text("status", { enum: membershipStatuses }).notNull(),
    subscriptionId: text("subscription_id").unique(),
    currentPeriodEnd: integer("current_period_end", { mode: "timestamp_ms" }).notNull(),
    startedAt: integer("started_at", { mode: "timestamp_ms" }).notNull(),
    canceledAt: integer("canceled_at", { mode: "timestamp_ms" }),
    /*
     * Facts from processor events, each only ever moved one way so events can arrive in any order
     * (lib/memberships/state.ts derives `status` and `currentPeriodEnd` from them).
     */
    /** The member asked to stop at the end of the paid period; perks run until then. */
    cancelAtPeriodEnd: integer("cancel_at_period_end", { mode: "boolean" }).notNull().default(false),
    /** Processor time of the subscription snapshot that last set cancelAtPeriodEnd (newest wins). */
    cancelFlagAt: integer("cancel_flag_at", { mode: "timestamp_ms" }),
    /** End of the latest period whose renewal payment failed; past due while it is after the paid period. */
    unpaidPeriodEnd: integer("unpaid_period_end", { mode: "timestamp_ms" }),
    /** When the subscription ended at the processor (canceled for good). */
    endedAt: integer("ended_at", { mode: "timestamp_ms" }),
  },
  (t) => [
    index("membership_user_idx").on(t.userId, t.status),
    // At most one live membership per person; canceled ones stay as history.
    uniqueIndex("membership_one_live_idx")
      .on(t.userId)
      .where(sql`${t.status} in ('active', 'past_due')`),
  ],
);

/** The processor's customer for each person, created once (idempotency key per user) and reused for every membership. */
export const billingCustomers = sqliteTable("billing_customer", {
  userId: text("user_id")
    .primaryKey()
    .references(() => users.id, { onDelete: "cascade" }),
  customerId: text("customer_id").notNull().unique(),
  createdAt: createdAt(),
});

/**
 * Every money movement, once. `externalRef` (processor event or object id plus kind) is unique
 * so a replayed webhook cannot write a second row.
 */
export const ledgerEntries = sqliteTable(
  "ledger_entry",
  {
    id: id(),
    kind: text("kind", { enum: ledgerKinds }).notNull(),
    /** Signed: money into the lab is positive, money out (refunds, fees) negative. */
    amountMinor: integer("amount_minor").notNull(),
    currency: text("currency").notNull(),
    campaignId: text("campaign_id").references(() => campaigns.id),
    pledgeId: text("pledge_id").references(() => pledges.id),
    membershipId: text("membership_id").references(() => memberships.id),
    externalRef: text("external_ref").notNull().unique(),
    memo: text("memo"),
    occurredAt: integer("occurred_at", { mode: "timestamp_ms" }).notNull(),
  },
  (t) => [index("ledger_campaign_idx").on(t.campaignId), index("ledger_occurred_idx").on(t.occurredAt)],
);

/**
 * Every payment-processor event the webhook endpoint accepted, by its id: a replayed or duplicated
 * delivery finds its row and changes nothing.
 */
export const processorEvents = sqliteTable("processor_event", {
  id: text("id").primaryKey(),
  type: text("type").notNull(),
  receivedAt: integer("received_at", { mode: "timestamp_ms" }).notNull(),
  processedAt: integer("processed_at", { mode: "timestamp_ms" }),
});

/* ---------- Goal-or-refund: refund requests ---------- */

export const refundReasons = ["lapsed", "withdrawn"] as const;
/** requested → succeeded; `attention` when the processor refuses it for good and a host must look. */
export const refundRequestStates = ["requested", "succeeded", "attention"] as const;

/**
 * One refund per paid pledge of a lapsed or withdrawn campaign, written in the transaction that
 * closes the campaign (or by the sweeper for a payment that lands later). The sweeper calls the
 * processor under the idempotency key `pledge-refund:<pledge id>` and then records the answer; a
 * sweeper that dies in between leaves the row `requested`, and the next pass re-sends the same key
 * and gets the same refund back. `leaseUntil` keeps two sweeps from calling at once.
 */
export const refundRequests = sqliteTable(
  "refund_request",
  {
    pledgeId: text("pledge_id")
      .primaryKey()
      .references(() => pledges.id),
    campaignId: text("campaign_id")
      .notNull()
      .references(() => campaigns.id),
    reason: text("reason", { enum: refundReasons }).notNull(),
    state: text("state", { enum: refundRequestStates }).notNull().default("requested"),
    /** The processor's refund id once known (it may still be pending there). */
    refundId: text("refund_id"),
    attempts: integer("attempts").notNull().default(0),
    lastError: text("last_error"),
    /** Not before this instant: a claim's lease, or the back-off after a transient failure. */
    leaseUntil: integer("lease_until", { mode: "timestamp_ms" }).notNull(),
    requestedAt: integer("requested_at", { mode: "timestamp_ms" }).notNull(),
    completedAt: integer("completed_at", { mode: "timestamp_ms" }),
  },
  (t) => [index("refund_request_due_idx").on(t.state, t.leaseUntil), index("refund_request_campaign_idx").on(t.campaignId, t.state)],
);

export type RefundRequest = typeof refundRequests.$inferSelect;
export type RefundReason = (typeof refundReasons)[number];

/* ---------- Reports ---------- */

export const reports = sqliteTable("report", {
  id: id(),
  campaignId: text("campaign_id")
    .notNull()
    .unique()
    .references(() => campaigns.id),
  state: text("state", { enum: reportStates }).notNull().default("draft"),
  summary: text("summary").notNull().default(""),
  bodyMd: text("body_md").notNull().default(""),
  videoUrl: text("video_url"),
  /** What the run actually cost, in the campaign's currency; null until known. */
  actualCostMinor: integer("actual_cost_minor"),
  /** "run_log" when computed from the jobs' filament and hours, "entered" when the host typed it. */
  actualCostSource: text("actual_cost_source", { enum: reportCostSources }),
  authorId: text("author_id").references(() => users.id),
  publishedAt: integer("published_at", { mode: "timestamp_ms" }),
  createdAt: createdAt(),
  updatedAt: updatedAt(),
});

/** One photo in a report: a piece printed as a variant. Shots taken in the same light share `lightSetKey`. */
export const reportPhotos = sqliteTable(
  "report_photo",
  {
    id: id(),
    reportId: text("report_id")
      .notNull()
      .references(() => reports.id, { onDelete: "cascade" }),
    pieceId: text("piece_id")
      .notNull()
      .references(() => testPlanPieces.id, { onDelete: "cascade" }),
    variantId: text("variant_id")
      .notNull()
      .references(() => testPlanVariants.id, { onDelete: "cascade" }),
    uploadId: text("upload_id")
      .notNull()
      .references(() => uploads.id),
    caption: text("caption").notNull().default(""),
    /** Order within the piece × variant slot, from 0. */
    position: integer("position").notNull().default(0),
    lightSetKey: text("light_set_key"),
    createdAt: createdAt(),
  },
  (t) => [
    index("report_photo_slot_idx").on(t.reportId, t.pieceId, t.variantId, t.position),
    uniqueIndex("report_photo_upload_idx").on(t.reportId, t.pieceId, t.variantId, t.uploadId),
  ],
);

/**
 * A variant's score on one criterion against the reference variant: −2 (much worse) … 0 (same as the
 * reference) … +2 (much better). `pieceId` null means the score is for the whole run.
 */
export const reportScores = sqliteTable(
  "report_score",
  {
    id: id(),
    reportId: text("report_id")
      .notNull()
      .references(() => reports.id, { onDelete: "cascade" }),
    pieceId: text("piece_id").references(() => testPlanPieces.id, { onDelete: "cascade" }),
    variantId: text("variant_id")
      .notNull()
      .references(() => testPlanVariants.id, { onDelete: "cascade" }),
    criterion: text("criterion").notNull(),
    score: integer("score").notNull(),
    note: text("note").notNull().default(""),
  },
  (t) => [
    // One score per cell: for the whole run (no piece) and per piece.
    uniqueIndex("report_score_run_cell_idx")
      .on(t.reportId, t.variantId, t.criterion)
      .where(sql`${t.pieceId} is null`),
    uniqueIndex("report_score_piece_cell_idx")
      .on(t.reportId, t.pieceId, t.variantId, t.criterion)
      .where(sql`${t.pieceId} is not null`),
    check("report_score_range", sql`${t.score} between -2 and 2`),
  ],
);

/** A short note a host posts on a campaign between funding and the report. */
export const labNotes = sqliteTable(
  "lab_note",
  {
    id: id(),
    campaignId: text("campaign_id")
      .notNull()
      .references(() => campaigns.id, { onDelete: "cascade" }),
    authorId: text("author_id")
      .notNull()
      .references(() => users.id),
    bodyMd: text("body_md").notNull(),
    createdAt: createdAt(),
    publishedAt: integer("published_at", { mode: "timestamp_ms" }),
  },
  (t) => [index("lab_note_campaign_idx").on(t.campaignId, t.publishedAt)],
);

/* ---------- E-mail outbox ---------- */

/**
 * Mail is written here in the same transaction as the event that causes it and sent later by a
 * worker. `dedupeKey` (recipient + event) is unique, so each message exists at most once.
 */
export const outbox = sqliteTable(
  "outbox",
  {
    id: id(),
    dedupeKey: text("dedupe_key").notNull().unique(),
    toAddress: text("to_address").notNull(),
    template: text("template").notNull(),
    subject: text("subject").notNull(),
    payload: text("payload", { mode: "json" }).$type<Record<string, unknown>>().notNull(),
    state: text("state", { enum: outboxStates }).notNull().default("queued"),
    attempts: integer("attempts").notNull().default(0),
    nextAttemptAt: integer("next_attempt_at", { mode: "timestamp_ms" }).notNull(),
    lastError: text("last_error"),
    createdAt: createdAt(),
    sentAt: integer("sent_at", { mode: "timestamp_ms" }),
    /** The recipient's account, for preferences and the unsubscribe link (null: no account). */
    userId: text("user_id"),
    /** `lib/email/categories.ts`, fixed when queued. */
    category: text("category").notNull().default("account"),
    /** The current send attempt; only that attempt may record a failure. */
    claimToken: text("claim_token"),
    /** Attempts whose worker stopped between claiming and recording: each may have reached the server. */
    interruptedAttempts: integer("interrupted_attempts").notNull().default(0),
    /** When it was sent, suppressed or given up. */
    finishedAt: integer("finished_at", { mode: "timestamp_ms" }),
  },
  (t) => [index("outbox_due_idx").on(t.state, t.nextAttemptAt)],
);

/** Which optional kinds of mail a supporter turned off or on; no row means on. */
export const emailPreferences = sqliteTable(
  "email_preference",
  {
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    category: text("category").notNull(),
    enabled: integer("enabled", { mode: "boolean" }).notNull(),
    /** "page" or "one-click" (the List-Unsubscribe POST). */
    changedVia: text("changed_via").notNull(),
    updatedAt: updatedAt(),
  },
  (t) => [primaryKey({ columns: [t.userId, t.category] })],
);
export type EmailPreference = typeof emailPreferences.$inferSelect;

/* ---------- Uploads ---------- */

export const uploads = sqliteTable(
  "upload",
  {
    id: id(),
    /** SHA-256 of the content, hex; also the stored file name. */
    sha256: text("sha256").notNull(),
    kind: text("kind", { enum: uploadKinds }).notNull(),
    mimeType: text("mime_type").notNull(),
    sizeBytes: integer("size_bytes").notNull(),
    originalName: text("original_name").notNull(),
    ownerId: text("owner_id")
      .notNull()
      .references(() => users.id),
    proposalId: text("proposal_id").references(() => proposals.id, { onDelete: "set null" }),
    /** Photos: SHA-256 of the stored thumbnail (WebP), and the cleaned image's size. */
    thumbnailSha256: text("thumbnail_sha256"),
    widthPx: integer("width_px"),
    heightPx: integer("height_px"),
    /** Models: the estimation engine's measurement of the mesh. */
    analysis: text("analysis", { mode: "json" }).$type<Record<string, unknown>>(),
    createdAt: createdAt(),
  },
  (t) => [index("upload_proposal_idx").on(t.proposalId), uniqueIndex("upload_owner_hash_idx").on(t.ownerId, t.sha256)],
);

/* ---------- Blind pairs ---------- */

/**
 * One person's judgement of one blind pair: two report photos of the same piece from two
 * variants. `pairKey` is the two photo ids in canonical (sorted) order, so (user, pair) is unique
 * however the pair was shown; `winnerPhotoId` null means "can't tell". `ticketNonce` is the
 * single-use pair ticket the vote spent (unique: a replayed ticket is refused).
 */
export const blindPairVotes = sqliteTable(
  "blind_pair_vote",
  {
    id: id(),
    campaignId: text("campaign_id")
      .notNull()
      .references(() => campaigns.id, { onDelete: "cascade" }),
    pieceId: text("piece_id")
      .notNull()
      .references(() => testPlanPieces.id, { onDelete: "cascade" }),
    pairKey: text("pair_key").notNull(),
    photoAId: text("photo_a_id")
      .notNull()
      .references(() => reportPhotos.id, { onDelete: "cascade" }),
    photoBId: text("photo_b_id")
      .notNull()
      .references(() => reportPhotos.id, { onDelete: "cascade" }),
    winnerPhotoId: text("winner_photo_id"),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    ticketNonce: text("ticket_nonce").notNull().unique(),
    /** When the pair was shown (from the ticket); the vote came at least the minimum delay later. */
    shownAt: integer("shown_at", { mode: "timestamp_ms" }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex("blind_pair_vote_user_pair_idx").on(t.userId, t.pairKey),
    index("blind_pair_vote_campaign_idx").on(t.campaignId, t.pairKey),
    check("blind_pair_vote_order", sql`${t.photoAId} < ${t.photoBId}`),
    check("blind_pair_vote_winner", sql`${t.winnerPhotoId} is null or ${t.winnerPhotoId} in (${t.photoAId}, ${t.photoBId})`),
  ],
);

/** What a duct proposal records of the duct helper's inputs. */
export type DuctDetails = {
  inlet: OpeningShape;
  outlets: OpeningShape[];
  /** Free text such as "50 mm radial blower"; the rating is the fan's free-air flow. */
  fan: { description: string; rating: FanFlowRating };
};

export type User = typeof users.$inferSelect;
export type NewUser = typeof users.$inferInsert;
export type StoredRole = (typeof storedRoles)[number];
export type Printer = typeof printers.$inferSelect;
export type NewPrinter = typeof printers.$inferInsert;
export type Proposal = typeof proposals.$inferSelect;
export type NewProposal = typeof proposals.$inferInsert;
export type ProposalState = (typeof proposalStates)[number];
export type Campaign = typeof campaigns.$inferSelect;
export type NewCampaign = typeof campaigns.$inferInsert;
export type CampaignState = (typeof campaignStates)[number];
export type TestPlan = typeof testPlans.$inferSelect;
export type TestPlanPiece = typeof testPlanPieces.$inferSelect;
export type TestPlanVariant = typeof testPlanVariants.$inferSelect;
export type Job = typeof jobs.$inferSelect;
export type LabStartWindow = typeof labStartWindows.$inferSelect;
export type LabClosure = typeof labClosures.$inferSelect;
export type PrinterMaintenance = typeof printerMaintenance.$inferSelect;
export type JobRun = typeof jobRuns.$inferSelect;
export type RunOutcome = (typeof runOutcomes)[number];
export type Pledge = typeof pledges.$inferSelect;
export type NewPledge = typeof pledges.$inferInsert;
export type PledgeState = (typeof pledgeStates)[number];
export type MembershipPlan = typeof membershipPlans.$inferSelect;
export type Membership = typeof memberships.$inferSelect;
export type BillingCustomer = typeof billingCustomers.$inferSelect;
export type LedgerEntry = typeof ledgerEntries.$inferSelect;
export type ProcessorEvent = typeof processorEvents.$inferSelect;
export type Report = typeof reports.$inferSelect;
export type ReportPhoto = typeof reportPhotos.$inferSelect;
export type ReportScore = typeof reportScores.$inferSelect;
export type LabNote = typeof labNotes.$inferSelect;
export type OutboxMessage = typeof outbox.$inferSelect;
export type Upload = typeof uploads.$inferSelect;
export type BlindPairVote = typeof blindPairVotes.$inferSelect;
export type TestPiece = typeof testPieces.$inferSelect;
export type ProposalFollower = typeof proposalFollowers.$inferSelect;
export type LabSettings = typeof labSettings.$inferSelect;
export type FilamentPrice = typeof filamentPrices.$inferSelect;
