import type { ProposalUploadView } from "@/db/queries/proposal-reads";
import type { DuctDetails } from "@/db/schema";
import type { MaterialId } from "@/lib/estimate/materials";
import type { FanFlowRating, OpeningShape } from "@/lib/estimate/duct";
import type { ProposalDraftInput, printerTypeValues, proposalKindValues } from "@/lib/validation/proposal";

/*
 * What the proposal form holds while someone types: numbers may still be missing (NaN from an
 * empty number input), selects may be unpicked (""). toProposalInput turns it into the input the
 * shared zod schemas check, on the client and again on the server.
 */

/** What the schemas hand back (draft and submission parse to the same shape). */
export type ProposalPayload = ProposalDraftInput;

export type OpeningValues = { kind: OpeningShape["kind"]; widthMm?: number; heightMm?: number; diameterMm?: number };

export type ProposalFormValues = {
  title: string;
  kind: (typeof proposalKindValues)[number] | "";
  printerType: (typeof printerTypeValues)[number] | "";
  why: string;
  descriptionMd: string;
  material: MaterialId | "";
  ductDetails: {
    inlet: OpeningValues;
    outlets: OpeningValues[];
    fan: { description: string; rating: { unit: FanFlowRating["unit"]; value?: number } };
  };
};

export const emptyOpening = (): OpeningValues => ({ kind: "rectangle", widthMm: undefined, heightMm: undefined, diameterMm: undefined });

export function emptyDuctDetails(): ProposalFormValues["ductDetails"] {
  return { inlet: emptyOpening(), outlets: [emptyOpening()], fan: { description: "", rating: { unit: "cfm", value: undefined } } };
}

const typed = (value: number | undefined) => typeof value === "number" && Number.isFinite(value);

/** Only the dimensions the opening's shape uses, so a rectangle's width does not ride along on a circle. */
function openingInput(opening: OpeningValues) {
  return opening.kind === "circle"
    ? { kind: opening.kind, diameterMm: opening.diameterMm }
    : { kind: opening.kind, widthMm: opening.widthMm, heightMm: opening.heightMm };
}

/** True once anything was typed into the duct section; an untouched section means "details later". */
export function ductDetailsTouched(details: ProposalFormValues["ductDetails"]): boolean {
  const openingTouched = (opening: OpeningValues) =>
    Object.values(openingInput(opening)).some((value) => typeof value === "number" && typed(value));
  return [details.inlet, ...details.outlets].some(openingTouched) || typed(details.fan.rating.value) || details.fan.description.trim() !== "";
}

export function toProposalInput(values: ProposalFormValues, uploadIds: readonly string[]) {
  return {
    title: values.title,
    kind: values.kind || undefined,
    printerType: values.printerType || undefined,
    why: values.why,
    descriptionMd: values.descriptionMd,
    material: values.kind === "material" ? values.material || null : null,
    ductDetails:
      values.kind === "duct" && ductDetailsTouched(values.ductDetails)
        ? {
            inlet: openingInput(values.ductDetails.inlet),
            outlets: values.ductDetails.outlets.map(openingInput),
            fan: values.ductDetails.fan,
          }
        : null,
    uploadIds: [...uploadIds],
  };
}

function openingValues(shape: OpeningShape): OpeningValues {
  return { ...emptyOpening(), ...shape };
}

/** A stored proposal as the form's starting values. */
export function formValuesFrom(proposal: {
  title: string;
  kind: ProposalFormValues["kind"];
  printerType: ProposalFormValues["printerType"];
  why: string;
  descriptionMd: string;
  material: string | null;
  ductDetails: DuctDetails | null;
}): ProposalFormValues {
  return {
    title: proposal.title,
    kind: proposal.kind,
    printerType: proposal.printerType,
    why: proposal.why,
    descriptionMd: proposal.descriptionMd,
    material: (proposal.material ?? "") as ProposalFormValues["material"],
    ductDetails: proposal.ductDetails
      ? {
          inlet: openingValues(proposal.ductDetails.inlet),
          outlets: proposal.ductDetails.outlets.map(openingValues),
          fan: { description: proposal.ductDetails.fan.description, rating: { ...proposal.ductDetails.fan.rating } },
        }
      : emptyDuctDetails(),
  };
}

export const emptyFormValues = (): ProposalFormValues => ({
  title: "",
  kind: "",
  printerType: "",
  why: "",
  descriptionMd: "",
  material: "",
  ductDetails: emptyDuctDetails(),
});

/** One file in the form's list: uploading, processing, done (with the server's upload) or refused. */
export type UploadItem = {
  key: string;
  name: string;
  sizeBytes: number;
  status: "uploading" | "processing" | "done" | "error";
  fraction: number;
  guessedKind: "model" | "photo" | "unknown";
  upload?: ProposalUploadView;
  error?: string;
};


/** An upload already on the proposal, as a finished row of the form's list. */
export function uploadItemFrom(upload: ProposalUploadView): UploadItem {
  return {
    key: upload.id,
    name: upload.originalName,
    sizeBytes: upload.sizeBytes,
    status: "done",
    fraction: 1,
    guessedKind: upload.kind,
    upload,
  };
}
