import { getMaterial, isMaterialId } from "./estimate/materials";

export type Caution = { id: string; title: string; text: string };

/** Above about 240 °C PTFE liners in hotends start to degrade and give off harmful fumes. */
export const PTFE_LIMIT_CELSIUS = 240;

const alwaysShown: Caution[] = [
  {
    id: "hot-parts",
    title: "Hot parts",
    text: "Nozzles and beds run hot enough to burn; let them cool before touching prints or swapping ducts.",
  },
  {
    id: "unattended",
    title: "Fire precautions",
    text: "Never leave a printer running unattended without smoke detection and a way to cut power.",
  },
];

/** Cautions a backer and the lab should see for a test printed in this material. */
export function materialCautions(material: string): Caution[] {
  const cautions = [...alwaysShown];
  if (!isMaterialId(material)) return cautions;
  const { id, fumeCaution, nozzleTemperatureCelsius } = getMaterial(material);
  if (fumeCaution === "strong") {
    cautions.push({
      id: "fumes",
      title: "Fumes and ultrafine particles",
      text: `${id} gives off styrene fumes and ultrafine particles when heated: print enclosed with filtration or extraction and ventilate the room.`,
    });
  } else if (fumeCaution === "moderate") {
    cautions.push({
      id: "fumes",
      title: "Fumes",
      text: `${id} gives off fumes and ultrafine particles when heated: ventilate the room.`,
    });
  }
  if (nozzleTemperatureCelsius.max > PTFE_LIMIT_CELSIUS) {
    cautions.push({
      id: "ptfe",
      title: "High hotend temperature",
      text: `${id} prints at up to ${nozzleTemperatureCelsius.max} °C; PTFE-lined hotends degrade above about ${PTFE_LIMIT_CELSIUS} °C — use an all-metal hotend.`,
    });
  }
  return cautions;
}

export const fanNoiseCaution: Caution = {
  id: "noise",
  title: "Loud blower fans",
  text: "High-output part-cooling blowers are loud at full speed: wear hearing protection when working beside them.",
};
