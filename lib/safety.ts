export type Caution = { id: string; title: string; text: string };

const styrenics = new Set(["ABS", "ASA", "HIPS"]);
const hotMaterials = new Set(["PC", "PA", "PA-CF", "ABS", "ASA"]);

/** Cautions a backer and the lab should see for a test printed in this material. */
export function materialCautions(material: string): Caution[] {
  const code = material.toUpperCase();
  const cautions: Caution[] = [
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
  if (styrenics.has(code)) {
    cautions.push({
      id: "fumes",
      title: "Fumes and ultrafine particles",
      text: `${code} gives off styrene fumes and ultrafine particles when heated: print enclosed with filtration or extraction and ventilate the room.`,
    });
  }
  if (hotMaterials.has(code)) {
    cautions.push({
      id: "ptfe",
      title: "High hotend temperature",
      text: "This material prints above about 240 °C, where PTFE-lined hotends start to degrade: use an all-metal hotend.",
    });
  }
  return cautions;
}

export const fanNoiseCaution: Caution = {
  id: "noise",
  title: "Loud blower fans",
  text: "High-output part-cooling blowers are loud at full speed: wear hearing protection when working beside them.",
};
