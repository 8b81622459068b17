import { fanNoiseCaution, materialCautions, type Caution } from "../safety";

const styreneCaution: Caution = {
  id: "styrenics",
  title: "Styrenics need a closed, filtered printer",
  text: "ABS and ASA give off styrene fumes and ultrafine particles: print them only in an enclosed printer with filtration or extraction, and ventilate the room.",
};

function unique(cautions: Caution[]): Caution[] {
  const seen = new Set<string>();
  return cautions.filter((caution) => (seen.has(caution.id) ? false : (seen.add(caution.id), true)));
}

/** What anyone working at the printers should keep in mind: heat, fire, fumes, noise. */
export function printerRoomCautions(): Caution[] {
  return unique([...materialCautions("PLA"), styreneCaution, fanNoiseCaution]);
}

/** The cautions for starting or clearing one job: the room's, plus its material's own. */
export function runCautions(material: string | null): Caution[] {
  return unique([...materialCautions(material ?? "PLA"), ...(material ? [] : [styreneCaution]), fanNoiseCaution]);
}
