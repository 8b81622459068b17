/*
 * The invented demo lab "Harbor Street Print Lab": every person, printer model, part, material
 * sample and test piece below is made up. Times are offsets from the seed's `now`, so the demo
 * always looks current. db/seed.ts turns this into rows.
 */

import type { CampaignState, ProposalState } from "./schema";

export const SEED_CURRENCY = "USD";

export const LAB = {
  labName: "Harbor Street Print Lab",
  currency: SEED_CURRENCY,
  timeZone: "America/Chicago",
  labourRateMinorPerHour: 3500,
  /** The card processor's published standard US rate: 2.9 % + 30 ¢ per successful charge. */
  feeBasisPoints: 290,
  feeFixedMinor: 30,
  contingencyPercent: 10,
  reportPrepHours: 24,
  planLabourHours: 3,
  requireSafetyNote: true,
} as const;

/** What the lab pays per kilogram, in cents (invented, in the range of common retail spools). */
export const FILAMENT_PRICES: readonly { material: string; pricePerKgMinor: number }[] = [
  { material: "PLA", pricePerKgMinor: 2200 },
  { material: "PETG", pricePerKgMinor: 2400 },
  { material: "ABS", pricePerKgMinor: 2300 },
  { material: "ASA", pricePerKgMinor: 2900 },
  { material: "TPU", pricePerKgMinor: 3400 },
  { material: "PC", pricePerKgMinor: 3900 },
  { material: "PA", pricePerKgMinor: 4600 },
];

/** The lab's piece library (invented pieces of our own naming); grams are PLA at reference scale. */
export const TEST_PIECES: readonly { slug: string; name: string; description: string; filamentGrams: number }[] = [
  {
    slug: "overhang-ladder",
    name: "Overhang ladder (5°/10°/15°)",
    description: "Steps overhanging at 5°, 10° and 15° from horizontal on all four sides, so every fan direction is tested.",
    filamentGrams: 18,
  },
  { slug: "bridge-span-set", name: "Bridge span set", description: "Bridges of 10 to 60 mm between pillars; sag is measured at mid-span.", filamentGrams: 14 },
  { slug: "hollow-spiral", name: "Hollow spiral", description: "A thin-walled spiral that shows cooling on curved overhangs.", filamentGrams: 11 },
  { slug: "thin-tower-pair", name: "Thin tower pair", description: "Two 5 mm towers 40 mm apart: small-layer cooling and stringing.", filamentGrams: 8 },
  { slug: "cooling-block", name: "Cooling block (20 mm)", description: "A solid block whose top corners curl when cooling is short.", filamentGrams: 9 },
  { slug: "dimension-gauge", name: "Dimension gauge", description: "Holes, pegs and slots of known size for dimensional accuracy.", filamentGrams: 12 },
];

/* ---------- Printers ---------- */

export type PrinterKey = "kestrel" | "wren" | "heron";

export interface SeedPrinter {
  key: PrinterKey;
  slug: string;
  name: string;
  model: string;
  motionType: "corexy" | "bedslinger";
  buildXmm: number;
  buildYmm: number;
  buildZmm: number;
  nozzleMm: number;
  maxFlowMm3PerS: number;
  efficiency: number;
  enclosed: boolean;
  materials: string[];
  hourlyRateMinor: number;
  heatUpMinutes: number;
  changeoverMinutes: number;
  handlingMinutesPerJob: number;
}

export const PRINTERS: readonly SeedPrinter[] = [
  {
    key: "kestrel",
    slug: "bay-1-kestrel",
    name: "Bay 1 — Kestrel",
    model: "Kestrel 300",
    motionType: "corexy",
    buildXmm: 300,
    buildYmm: 300,
    buildZmm: 300,
    nozzleMm: 0.4,
    maxFlowMm3PerS: 32,
    efficiency: 0.55,
    enclosed: false,
    materials: ["PLA", "PETG", "TPU"],
    hourlyRateMinor: 180,
    heatUpMinutes: 5,
    changeoverMinutes: 15,
    handlingMinutesPerJob: 4,
  },
  {
    key: "wren",
    slug: "bay-2-wren",
    name: "Bay 2 — Wren",
    model: "Wren 220",
    motionType: "bedslinger",
    buildXmm: 220,
    buildYmm: 220,
    buildZmm: 250,
    nozzleMm: 0.4,
    maxFlowMm3PerS: 15,
    efficiency: 0.6,
    enclosed: false,
    materials: ["PLA", "PETG", "TPU"],
    hourlyRateMinor: 110,
    heatUpMinutes: 4,
    changeoverMinutes: 12,
    handlingMinutesPerJob: 4,
  },
  {
    key: "heron",
    slug: "bay-3-heron",
    name: "Bay 3 — Heron",
    model: "Heron 350",
    motionType: "corexy",
    buildXmm: 350,
    buildYmm: 350,
    buildZmm: 350,
    nozzleMm: 0.4,
    maxFlowMm3PerS: 28,
    efficiency: 0.55,
    enclosed: true,
    materials: ["PLA", "PETG", "ABS", "ASA", "PC", "PA"],
    hourlyRateMinor: 240,
    heatUpMinutes: 8,
    changeoverMinutes: 20,
    handlingMinutesPerJob: 5,
  },
];

/* ---------- Filament Club plans ---------- */

export type PlanCode = "spool" | "reel" | "workshop";

export const PLANS: readonly {
  code: PlanCode;
  name: string;
  monthlyMinor: number;
  monthlyVotes: number;
  earlyBlindPairs: boolean;
  position: number;
}[] = [
  { code: "spool", name: "Spool", monthlyMinor: 500, monthlyVotes: 3, earlyBlindPairs: false, position: 1 },
  { code: "reel", name: "Reel", monthlyMinor: 1200, monthlyVotes: 8, earlyBlindPairs: true, position: 2 },
  { code: "workshop", name: "Workshop", monthlyMinor: 3000, monthlyVotes: 20, earlyBlindPairs: true, position: 3 },
];

/* ---------- People ---------- */

export interface SeedUser {
  key: string;
  email: string;
  name: string;
  role: "supporter" | "host" | "admin";
  /** Account created this many days before `now`. */
  createdDaysAgo: number;
}

/** One account per role; their e-mails are fixed (lib/demo-accounts.ts and tests rely on them). */
export const DEMO_USERS: readonly SeedUser[] = [
  { key: "owner", email: "owner@harbor-street.example", name: "Rosa Tamberg", role: "admin", createdDaysAgo: 540 },
  { key: "host", email: "host@harbor-street.example", name: "Eli Navarro-Brandt", role: "host", createdDaysAgo: 530 },
  { key: "member", email: "member@harbor-street.example", name: "Mina Sato-Ferris", role: "supporter", createdDaysAgo: 300 },
  {
    key: "supporter",
    email: "supporter@harbor-street.example",
    name: "Jules Adeyemi-Hart",
    role: "supporter",
    createdDaysAgo: 120,
  },
];

/** Invented backers: first names and family names deliberately mixed across languages. */
const BACKER_NAMES: readonly (readonly [string, string])[] = [
  ["Ines", "Varga"],
  ["Tomasz", "Lindqvist"],
  ["Aiko", "Brennan"],
  ["Mateo", "Okonkwo"],
  ["Freya", "Castellanos"],
  ["Kwame", "Haugland"],
  ["Leilani", "Petrov"],
  ["Soren", "Achterberg"],
  ["Nadia", "Quispe"],
  ["Rafael", "Thorsen"],
  ["Yuki", "Delacroix"],
  ["Oluwaseun", "Marsh"],
  ["Hana", "Kowalczyk"],
  ["Dmitri", "Abernathy"],
  ["Esperanza", "Nakamura"],
  ["Lars", "Odhiambo"],
  ["Mei", "Fairweather"],
  ["Tariq", "Lindgren"],
  ["Zofia", "Ramírez"],
  ["Kwabena", "Bergström"],
  ["Ingrid", "Oyelaran"],
  ["Anand", "Kowalski"],
  ["Lucía", "Haverkamp"],
  ["Emeka", "Sorensen"],
  ["Saoirse", "Tanaka"],
  ["Jonas", "Abiodun"],
  ["Farah", "Lindholm"],
  ["Pavel", "Moreno"],
  ["Chioma", "Vestergaard"],
  ["Arjun", "Halvorsen"],
  ["Noemi", "Szabo"],
  ["Bilal", "Whitcombe"],
];

function asciiSlug(text: string): string {
  return text
    .normalize("NFD")
    .replace(/[\u0300-\u036f]/g, "")
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, "-")
    .replace(/^-|-$/g, "");
}

export const BACKERS: readonly SeedUser[] = BACKER_NAMES.map(([first, last], i) => ({
  key: `b${String(i + 1).padStart(2, "0")}`,
  email: `${asciiSlug(first)}.${asciiSlug(last)}@backers.example`,
  name: `${first} ${last}`,
  role: "supporter" as const,
  createdDaysAgo: 460 - i * 11,
}));

/* ---------- Filament Club memberships ---------- */

export type SeedMembership =
  /** Paid `periods` months; the current one started `daysIntoPeriod` days ago. */
  | { key: string; userKey: string; plan: PlanCode; status: "active"; periods: number; daysIntoPeriod: number }
  /** Paid `periods` months; the renewal `daysOverdue` days ago failed. */
  | { key: string; userKey: string; plan: PlanCode; status: "past_due"; periods: number; daysOverdue: number }
  /** Paid `periods` months, then canceled; the last paid period ended `endedDaysAgo` days ago. */
  | { key: string; userKey: string; plan: PlanCode; status: "canceled"; periods: number; endedDaysAgo: number };

export const MEMBERSHIPS: readonly SeedMembership[] = [
  { key: "member", userKey: "member", plan: "reel", status: "active", periods: 7, daysIntoPeriod: 9 },
  { key: "b01", userKey: "b01", plan: "workshop", status: "active", periods: 13, daysIntoPeriod: 3 },
  { key: "b03", userKey: "b03", plan: "spool", status: "active", periods: 5, daysIntoPeriod: 21 },
  { key: "b05", userKey: "b05", plan: "reel", status: "active", periods: 10, daysIntoPeriod: 14 },
  { key: "b08", userKey: "b08", plan: "spool", status: "active", periods: 2, daysIntoPeriod: 6 },
  { key: "b11", userKey: "b11", plan: "reel", status: "active", periods: 4, daysIntoPeriod: 27 },
  { key: "b14", userKey: "b14", plan: "workshop", status: "active", periods: 8, daysIntoPeriod: 11 },
  { key: "b17", userKey: "b17", plan: "spool", status: "active", periods: 11, daysIntoPeriod: 1 },
  { key: "b20", userKey: "b20", plan: "reel", status: "active", periods: 3, daysIntoPeriod: 18 },
  { key: "b23", userKey: "b23", plan: "spool", status: "past_due", periods: 3, daysOverdue: 3 },
  { key: "b26", userKey: "b26", plan: "reel", status: "canceled", periods: 4, endedDaysAgo: 40 },
];

/* ---------- Proposals ---------- */

export interface SeedProposal {
  key: string;
  slug: string;
  title: string;
  kind: "duct" | "material" | "nozzle" | "part";
  printerType: "corexy" | "bedslinger";
  why: string;
  descriptionMd: string;
  state: ProposalState;
  proposerKey: string;
  createdDaysAgo: number;
  /** Days after creation it was submitted (drafts have none). */
  submittedAfterDays?: number;
  mergedIntoKey?: string;
  declineReason?: string;
  /** Material proposals: the material heated (drives the safety cautions). */
  material?: "PLA" | "PETG" | "ASA" | "PA";
  safetyNote?: string;
}

export const PROPOSALS: readonly SeedProposal[] = [
  {
    key: "twin-inlet",
    slug: "twin-inlet-ring-duct-for-the-kestrel",
    title: "Twin-inlet ring duct for the Kestrel",
    kind: "duct",
    printerType: "corexy",
    why: "The stock duct blows from one side, so overhangs facing away from it curl at high speed. A ring fed from two inlets should cool the whole perimeter evenly — but rings often starve the far side. I would like to know whether this one actually helps at 24 mm³/s.",
    descriptionMd: `## The part
A closed ring around the nozzle, fed by **two** blower inlets at the back-left and back-right.
Outlets are angled at 45° or 60° (two versions), aimed about 2 mm below the nozzle tip.

## What I expect
- More even overhangs in all four directions
- Slightly worse bridging near the inlets (turbulence)
- Same or slightly worse clearance over tall parts

## Notes
| | stock | ring, 45° | ring, 60° |
|---|---|---|---|
| outlet area | 38 mm² | 44 mm² | 44 mm² |
| mass | 9 g | 14 g | 14 g |

Both versions print in PETG without supports; the model files are attached.`,
    state: "accepted",
    proposerKey: "b04",
    createdDaysAgo: 32,
    submittedAfterDays: 1,
  },
  {
    key: "ring-duplicate",
    slug: "ring-duct-with-two-inlets",
    title: "Ring duct with two inlets",
    kind: "duct",
    printerType: "corexy",
    why: "Saw a two-inlet ring design in a maker forum and wondered if it beats the stock duct on fast CoreXY machines.",
    descriptionMd: `## Idea
A ring-shaped duct with two inlets instead of one side blower.

- Same blower, split in two
- Should help overhangs on the side facing away from the fan`,
    state: "merged",
    proposerKey: "b19",
    createdDaysAgo: 27,
    submittedAfterDays: 0,
    mergedIntoKey: "twin-inlet",
  },
  {
    key: "hardened-nozzle",
    slug: "hardened-0-6-mm-nozzle-at-high-flow",
    title: "Hardened 0.6 mm nozzle at high flow",
    kind: "nozzle",
    printerType: "corexy",
    why: "Hardened nozzles conduct heat worse than brass, so people say they lose flow. With a 0.6 mm bore and a longer melt zone that may not matter. Worth measuring before everyone switches for abrasive filaments.",
    descriptionMd: `## Question
Does a hardened-steel 0.6 mm nozzle keep up with the stock 0.4 mm brass nozzle **at the same
volumetric flow**, and where does it start to under-extrude?

## Proposed method
1. Print a flow staircase from 8 to 32 mm³/s with each nozzle
2. Print the same hollow spiral and stiffness beam at 30 mm³/s
3. Weigh every part and break the beams

## Variants
- Stock 0.4 mm brass (reference)
- Hardened steel 0.6 mm, standard melt zone
- Hardened steel 0.6 mm, long melt zone`,
    state: "accepted",
    proposerKey: "b09",
    createdDaysAgo: 14,
    submittedAfterDays: 1,
  },
  {
    key: "matte-pla",
    material: "PLA",
    slug: "matte-pla-plus-stiffness-and-overhangs",
    title: "Matte PLA+ stiffness and overhangs",
    kind: "material",
    printerType: "bedslinger",
    why: "Matte PLA+ is sold as tougher than plain PLA, but matte fillers often make parts more brittle. I print brackets with it and want real numbers, plus a look at how it handles overhangs on a bed-slinger.",
    descriptionMd: `## Materials
Two unbranded matte PLA+ samples (grey and white) against a plain PLA reference spool.

## What to measure
- **Stiffness:** three-point bending of a printed beam, force at 2 mm deflection
- **Toughness:** does it snap or bend at failure?
- **Overhangs:** the overhang ladder at 100 % fan

> The samples arrive sealed; please dry them for 4 h at 50 °C like the reference.`,
    state: "accepted",
    proposerKey: "b12",
    createdDaysAgo: 38,
    submittedAfterDays: 2,
  },
  {
    key: "side-blower",
    slug: "low-profile-side-blower-duct",
    title: "Low-profile side blower duct",
    kind: "duct",
    printerType: "bedslinger",
    why: "The Wren's stock duct sits low and scrapes curled edges. A flatter side blower would give clearance, but may cool worse. I want to know the price of clearance.",
    descriptionMd: `## The part
A flat duct that sits 4 mm higher than stock and blows from the left only.

- Needs no extra screws
- Prints flat, no supports

## Risk
Cooling on the right side of the part will likely be weaker.`,
    state: "accepted",
    proposerKey: "b15",
    createdDaysAgo: 60,
    submittedAfterDays: 1,
  },
  {
    key: "asa-warp",
    material: "ASA",
    safetyNote: "ASA releases styrene fumes: printed only in the enclosed Heron with its filter running, room ventilated, nobody at the printer while it runs.",
    slug: "asa-corner-lift-in-an-enclosed-printer",
    title: "ASA corner lift in an enclosed printer",
    kind: "material",
    printerType: "corexy",
    why: "ASA is great outdoors but lifts at the corners on long parts. I would like to see two ASA samples against a reference in a warm enclosure, with the same low fan, to know which one to trust for long brackets.",
    descriptionMd: `## Samples
- Reference ASA spool (natural)
- ASA sample A (grey, UV-stabilised)
- ASA sample B (black)

## Pieces
A corner-lift tab set, a 200 mm flat bar and a hole-and-peg gauge for shrinkage.

## Safety
ASA gives off styrene-based fumes and ultrafine particles when heated. Please print it
enclosed and vented, and don't stand over the open door.`,
    state: "accepted",
    proposerKey: "b06",
    createdDaysAgo: 52,
    submittedAfterDays: 1,
  },
  {
    key: "petg-bridging",
    material: "PETG",
    slug: "petg-bridging-with-100-percent-fan",
    title: "PETG bridging with 100 % fan",
    kind: "material",
    printerType: "corexy",
    why: "Common advice is to keep the fan low for PETG, but on a fast printer bridges sag without it. Is full fan really hurting layer bonding, or is that advice from slow printers?",
    descriptionMd: `## Question
At **100 %** part-cooling fan, how do bridges, overhangs and thin towers in PETG compare
between samples — and do the thin towers still bond?

## Plan
| piece | measures |
|---|---|
| Bridge span set | sag per span length |
| Overhang ladder | curl and droop |
| Thin tower pair | layer bonding (snap test) |

Three PETG spools: one reference and two samples.`,
    state: "accepted",
    proposerKey: "b02",
    createdDaysAgo: 58,
    submittedAfterDays: 1,
  },
  {
    key: "wide-mouth",
    slug: "wide-mouth-blower-duct-for-the-wren",
    title: "Wide-mouth blower duct for the Wren",
    kind: "duct",
    printerType: "bedslinger",
    why: "A wider outlet should spread air along the whole nozzle and help bridges on small bed-slingers. Two versions exist: a plain wide mouth and one with an internal splitter.",
    descriptionMd: `## Variants
- Stock duct (reference)
- Wide-mouth duct
- Wide-mouth duct with an internal splitter

## Why it might work
The stock outlet is 6 mm wide; the wide mouth is 14 mm, so air reaches both sides of a bridge.

## Why it might not
- Lower air speed at the outlet
- More air hitting the nozzle itself, cooling it`,
    state: "accepted",
    proposerKey: "b10",
    createdDaysAgo: 95,
    submittedAfterDays: 2,
  },
  {
    key: "tpu-path",
    slug: "short-path-tpu-feeding-on-a-bed-slinger",
    title: "Short-path TPU feeding on a bed-slinger",
    kind: "part",
    printerType: "bedslinger",
    why: "Soft TPU buckles in long feed paths. A short constrained guide between gears and hotend might let the Wren print 95A TPU twice as fast.",
    descriptionMd: `## The part
A printed filament guide that closes the gap between the drive gears and the heat break.

## Test idea
- Flow staircase in TPU with and without the guide
- Count jams over a 2-hour print`,
    state: "submitted",
    proposerKey: "b13",
    createdDaysAgo: 9,
    submittedAfterDays: 0,
  },
  {
    key: "nozzle-wear",
    slug: "coated-brass-vs-steel-nozzle-wear",
    title: "Coated brass vs steel nozzle wear",
    kind: "nozzle",
    printerType: "corexy",
    why: "Coated brass nozzles claim to resist wear almost as well as steel while keeping brass heat transfer. A long abrasive print could show the bore growth.",
    descriptionMd: `## Proposal
Run 500 g of an abrasive-filled PLA through each nozzle and measure:

1. Bore diameter before and after (pin gauges)
2. Extrusion width on a single-wall spiral
3. Surface of a cooling block

| nozzle | bore | coating |
|---|---|---|
| brass | 0.4 mm | none |
| coated brass | 0.4 mm | hard coat |
| steel | 0.4 mm | none |`,
    state: "submitted",
    proposerKey: "b18",
    createdDaysAgo: 6,
    submittedAfterDays: 1,
  },
  {
    key: "sheet-texture",
    slug: "spring-steel-sheet-texture-and-first-layer-grip",
    title: "Spring-steel sheet texture and first-layer grip",
    kind: "part",
    printerType: "bedslinger",
    why: "Textured and smooth sheets behave very differently with PETG. Measuring peel force would settle a lot of arguments.",
    descriptionMd: `## Sheets
- Smooth coated sheet
- Fine texture
- Coarse texture

## Measure
Peel force on a printed tab set, in PLA and PETG, at two bed temperatures.`,
    state: "submitted",
    proposerKey: "b21",
    createdDaysAgo: 3,
    submittedAfterDays: 0,
  },
  {
    key: "cf-nylon",
    material: "PA",
    slug: "carbon-filled-nylon-on-an-open-frame-printer",
    title: "Carbon-filled nylon on an open-frame printer",
    kind: "material",
    printerType: "corexy",
    why: "Can an open-frame CoreXY print carbon-filled nylon well enough for functional parts?",
    descriptionMd: `## Idea
Print carbon-filled PA on the Kestrel with a hardened nozzle, compare to the Heron.

- Warping on long bars
- Layer bonding`,
    state: "declined",
    proposerKey: "b25",
    createdDaysAgo: 44,
    submittedAfterDays: 0,
    declineReason:
      "Nylon needs a warm enclosure and dry filament; on our open-frame Kestrel the result would mostly measure the room, not the material. We'd happily test it on the enclosed Heron — please resubmit it for an enclosed printer.",
  },
  {
    key: "silk-adhesion",
    material: "PLA",
    slug: "silk-pla-layer-adhesion-at-speed",
    title: "Silk PLA layer adhesion at speed",
    kind: "material",
    printerType: "corexy",
    why: "Silk PLA looks great but I think it splits along layers when printed fast.",
    descriptionMd: `## Draft
Still collecting the samples. Want to compare:

- Silk PLA at 12 and 24 mm³/s
- Plain PLA at the same flows`,
    state: "draft",
    proposerKey: "supporter",
    createdDaysAgo: 2,
  },
];

/* ---------- Campaigns ---------- */

export interface SeedPiece {
  name: string;
  filamentGrams: number;
}

export interface SeedPlan {
  printerKey: PrinterKey;
  material: "PLA" | "PETG" | "ASA";
  layerHeightMm: number;
  maxFlowMm3PerS: number;
  fanPercent: number;
  repeats: number;
  pieces: readonly SeedPiece[];
  /** The first variant is the reference. */
  variants: readonly string[];
  notesMd: string;
}

export interface ForcedPledge {
  userKey: string;
  amountMinor: number;
  publicName?: string;
}

export interface SeedCampaign {
  key: string;
  slug: string;
  proposalKey?: string;
  title: string;
  summary: string;
  state: CampaignState;
  openedDaysAgo: number;
  /** Negative: the deadline is in the past. */
  deadlineInDays: number;
  /** Paid (or, for lapsed, refunded) pledges stop this many days before `now`. */
  pledgesEndDaysAgo: number;
  /** Target share of the goal raised in paid pledges (≥ 1 for funded states). */
  raiseShare: number;
  forcedPledges: readonly ForcedPledge[];
  pendingPledges: number;
  failedPledges: number;
  plan: SeedPlan;
  /** Jobs: none (not yet scheduled), all scheduled from a start, in progress, or all done. */
  jobs:
    | { mode: "none" }
    | { mode: "scheduled"; startInDays: number }
    | { mode: "printing" }
    | { mode: "done"; startDaysAgo: number };
  /** Lab-fund allocation, minor units (stored as a negative fund_allocation entry). */
  labFundMinor?: number;
  labFundMemo?: string;
  report?: { summary: string; bodyMd: string; publishedDaysAgo: number; videoUrl: string | null };
}

const OVERHANG = { name: "Overhang ladder (30°–70°)", filamentGrams: 18 };
const BRIDGES = { name: "Bridge span set (10–60 mm)", filamentGrams: 14 };
const COOLING = { name: "Cooling block (20 mm)", filamentGrams: 9 };
const THIN = { name: "Thin tower pair", filamentGrams: 8 };
const PLAQUE = { name: "Lettered plaque", filamentGrams: 12 };
const BEAM = { name: "Stiffness beam (3-point)", filamentGrams: 16 };
const SPIRAL = { name: "Hollow spiral (single wall)", filamentGrams: 22 };
const STAIRCASE = { name: "Flow staircase (8–32 mm³/s)", filamentGrams: 35 };
const CORNER_TABS = { name: "Corner-lift tab set", filamentGrams: 28 };
const FLAT_BAR = { name: "Long flat bar (200 mm)", filamentGrams: 42 };
const HOLE_GAUGE = { name: "Hole and peg gauge", filamentGrams: 10 };

const DUCT_NOTES = `Same slicer profile for every variant; only the duct changes. Ducts are swapped with the
printer cold, and each variant starts with one purge line. Photos under the light box at 5600 K.`;
const MATERIAL_NOTES = `All spools dried for 4 h at 50 °C (PLA/PETG) or 65 °C (ASA) and printed within 2 hours of
drying. Same slicer profile for every sample except nozzle temperature, which follows each label.`;

export const CAMPAIGNS: readonly SeedCampaign[] = [
  {
    key: "twin-inlet",
    slug: "twin-inlet-ring-duct-vs-stock",
    proposalKey: "twin-inlet",
    title: "Twin-inlet ring duct vs stock on the Kestrel",
    summary:
      "Two versions of a ring duct fed from two inlets, against the Kestrel's stock duct: overhangs in four directions, bridges, small-layer cooling and thin towers at 24 mm³/s.",
    state: "open",
    openedDaysAgo: 18,
    deadlineInDays: 12,
    pledgesEndDaysAgo: 0.2,
    raiseShare: 0.6,
    forcedPledges: [{ userKey: "member", amountMinor: 2500, publicName: "Mina S." }],
    pendingPledges: 2,
    failedPledges: 1,
    plan: {
      printerKey: "kestrel",
      material: "PLA",
      layerHeightMm: 0.2,
      maxFlowMm3PerS: 24,
      fanPercent: 100,
      repeats: 3,
      pieces: [OVERHANG, BRIDGES, COOLING, THIN],
      variants: ["Stock duct", "Twin-inlet ring duct, 45° outlets", "Twin-inlet ring duct, 60° outlets"],
      notesMd: DUCT_NOTES,
    },
    jobs: { mode: "none" },
  },
  {
    key: "hardened-nozzle",
    slug: "hardened-0-6-mm-nozzle-at-high-flow",
    proposalKey: "hardened-nozzle",
    title: "Hardened 0.6 mm nozzle at high flow",
    summary:
      "Does a hardened-steel 0.6 mm nozzle keep up with stock brass at 30 mm³/s? A flow staircase, a single-wall spiral and stiffness beams, every part weighed.",
    state: "open",
    openedDaysAgo: 2,
    deadlineInDays: 25,
    pledgesEndDaysAgo: 0.1,
    raiseShare: 0.15,
    forcedPledges: [{ userKey: "supporter", amountMinor: 1000 }],
    pendingPledges: 1,
    failedPledges: 0,
    plan: {
      printerKey: "kestrel",
      material: "PLA",
      layerHeightMm: 0.2,
      maxFlowMm3PerS: 30,
      fanPercent: 80,
      repeats: 2,
      pieces: [STAIRCASE, SPIRAL, BEAM],
      variants: [
        "Stock 0.4 mm brass nozzle",
        "Hardened steel 0.6 mm nozzle",
        "Hardened steel 0.6 mm nozzle, long melt zone",
      ],
      notesMd: `Each nozzle is installed hot, torqued the same and given a 200 mm purge before the first
piece. The flow staircase is weighed step by step to find where extrusion falls short.`,
    },
    jobs: { mode: "none" },
  },
  {
    key: "matte-pla",
    slug: "matte-pla-plus-stiffness-and-overhangs",
    proposalKey: "matte-pla",
    title: "Matte PLA+ stiffness and overhangs",
    summary:
      "Two matte PLA+ samples against a plain PLA reference on the Wren: three-point bending, overhangs at full fan and a lettered plaque for surface detail.",
    state: "funded",
    openedDaysAgo: 20,
    deadlineInDays: 4,
    pledgesEndDaysAgo: 1,
    raiseShare: 1.08,
    forcedPledges: [{ userKey: "supporter", amountMinor: 1500, publicName: "Jules A." }],
    pendingPledges: 0,
    failedPledges: 0,
    plan: {
      printerKey: "wren",
      material: "PLA",
      layerHeightMm: 0.2,
      maxFlowMm3PerS: 12,
      fanPercent: 100,
      repeats: 3,
      pieces: [BEAM, OVERHANG, PLAQUE],
      variants: ["Reference spool (plain PLA)", "Matte PLA+ sample A (grey)", "Matte PLA+ sample B (white)"],
      notesMd: MATERIAL_NOTES,
    },
    jobs: { mode: "none" },
  },
  {
    key: "side-blower",
    slug: "low-profile-side-blower-duct",
    proposalKey: "side-blower",
    title: "Low-profile side blower duct",
    summary:
      "A flatter side blower for the Wren that buys 4 mm of clearance — at what cost in cooling? Overhangs, bridges and a cooling block against the stock duct.",
    state: "lapsed",
    openedDaysAgo: 45,
    deadlineInDays: -15,
    pledgesEndDaysAgo: 16,
    raiseShare: 0.45,
    forcedPledges: [{ userKey: "supporter", amountMinor: 2000 }],
    pendingPledges: 0,
    failedPledges: 0,
    plan: {
      printerKey: "wren",
      material: "PLA",
      layerHeightMm: 0.2,
      maxFlowMm3PerS: 12,
      fanPercent: 100,
      repeats: 2,
      pieces: [OVERHANG, BRIDGES, COOLING],
      variants: ["Stock duct", "Low-profile side blower duct"],
      notesMd: DUCT_NOTES,
    },
    jobs: { mode: "none" },
  },
  {
    key: "asa-warp",
    slug: "asa-corner-lift-in-the-heron",
    proposalKey: "asa-warp",
    title: "ASA corner lift in the Heron",
    summary:
      "Two ASA samples against a reference spool in the enclosed Heron at 20 % fan: corner lift on a tab set, bow on a 200 mm bar, and shrinkage on a hole-and-peg gauge.",
    state: "queued",
    openedDaysAgo: 35,
    deadlineInDays: -5,
    pledgesEndDaysAgo: 6,
    raiseShare: 1.05,
    forcedPledges: [],
    pendingPledges: 0,
    failedPledges: 0,
    plan: {
      printerKey: "heron",
      material: "ASA",
      layerHeightMm: 0.2,
      maxFlowMm3PerS: 18,
      fanPercent: 20,
      repeats: 3,
      pieces: [CORNER_TABS, FLAT_BAR, HOLE_GAUGE],
      variants: ["Reference spool (ASA, natural)", "ASA sample A (grey, UV-stabilised)", "ASA sample B (black)"],
      notesMd: `${MATERIAL_NOTES}

The chamber is preheated to 45 °C and vented through the filter between jobs; nobody opens the
door during a print (ASA fumes).`,
    },
    jobs: { mode: "scheduled", startInDays: 2 },
  },
  {
    key: "petg-bridging",
    slug: "petg-bridging-with-100-percent-fan",
    proposalKey: "petg-bridging",
    title: "PETG bridging with 100 % fan",
    summary:
      "Three PETG spools at full part-cooling fan on the Kestrel: how much do bridges sag, do overhangs curl, and do thin towers still bond?",
    state: "printing",
    openedDaysAgo: 40,
    deadlineInDays: -10,
    pledgesEndDaysAgo: 11,
    raiseShare: 1.1,
    forcedPledges: [{ userKey: "member", amountMinor: 2000 }],
    pendingPledges: 0,
    failedPledges: 0,
    plan: {
      printerKey: "kestrel",
      material: "PETG",
      layerHeightMm: 0.2,
      maxFlowMm3PerS: 20,
      fanPercent: 100,
      repeats: 2,
      pieces: [BRIDGES, OVERHANG, THIN],
      variants: ["Reference spool (PETG, clear)", "PETG sample A (translucent blue)", "PETG sample B (opaque white)"],
      notesMd: MATERIAL_NOTES,
    },
    jobs: { mode: "printing" },
    labFundMinor: 4000,
    labFundMemo: "Lab fund: a spare spool of each sample in case a repeat has to be reprinted",
  },
  {
    key: "wide-mouth",
    slug: "wide-mouth-blower-duct-for-the-wren",
    proposalKey: "wide-mouth",
    title: "Wide-mouth blower duct for the Wren",
    summary:
      "A plain wide-mouth duct and one with an internal splitter against the Wren's stock duct: overhangs, bridges, a cooling block and a lettered plaque.",
    state: "reported",
    openedDaysAgo: 75,
    deadlineInDays: -45,
    pledgesEndDaysAgo: 47,
    raiseShare: 1.12,
    forcedPledges: [{ userKey: "member", amountMinor: 3000, publicName: "Mina Sato-Ferris" }],
    pendingPledges: 0,
    failedPledges: 0,
    plan: {
      printerKey: "wren",
      material: "PLA",
      layerHeightMm: 0.2,
      maxFlowMm3PerS: 12,
      fanPercent: 100,
      repeats: 3,
      pieces: [OVERHANG, BRIDGES, COOLING, PLAQUE],
      variants: ["Stock duct", "Wide-mouth duct", "Wide-mouth duct with splitter"],
      notesMd: DUCT_NOTES,
    },
    jobs: { mode: "done", startDaysAgo: 40 },
    report: {
      publishedDaysAgo: 20,
      videoUrl: "https://video.harbor-street.example/reports/wide-mouth-blower-duct",
      summary:
        "The splitter version is the clear winner on bridges and overhangs facing away from the fan; the plain wide mouth cools more evenly than stock but sags more on long bridges. Neither duct hurt surface quality on small layers.",
      bodyMd: `## What we tested
Two wide-mouth blower ducts against the Wren's stock duct, in PLA at 12 mm³/s and 100 % fan,
0.2 mm layers, three repeats of four pieces each — 36 prints in all.

## Ratings behind the scorecard
Our bench ratings, 0–10 against the stock duct (5 = same as stock), averaged over three repeats; the
scorecard above condenses them to −2…+2.

| piece | criterion | stock | wide mouth | wide mouth + splitter |
|---|---|---|---|---|
| Overhang ladder (30°–70°) | curl on the far side | 5 | 6.3 | 7.7 |
| Bridge span set (10–60 mm) | sag on the 60 mm span | 5 | 4.0 | 7.0 |
| Cooling block (20 mm) | top-surface gloss and sharp edges | 5 | 6.0 | 6.3 |
| Lettered plaque | legibility of 3 mm letters | 5 | 5.3 | 5.7 |

## What we learned
- **The splitter matters.** Without it the wide mouth spreads the air but slows it, and the
  longest bridges sag about 0.4 mm more than stock.
- **Far-side overhangs improve with both ducts**, most with the splitter.
- Nozzle temperature dropped by 3 °C with both wide ducts at 100 % fan; the firmware
  compensated, but watch it if your heater is weak.

## Caveats
One printer, one material, one set of settings. The ducts were printed in PETG by us from the
proposer's files; a different print of them may behave differently.

## Safety
At 100 % the blower is loud at close range — we wear hearing protection when tuning. The
hotend stays hot for several minutes after a print; swap ducts only when it has cooled.`,
    },
  },
];
