// The one catalogue of safety cautions and the selector that picks those that fit a
// piece of work: the care tasks done, the finish classes applied, whether the piece has resin, and
// who reads (an owner at home, or a technician on a visit). Pure data: the owner's guide, the drawer
// card, care reminders, the technician's day, the job page and the visit mails all read it.
import { OIL_FINISH_CLASSES, TASK_KIND_BY_FINISH_CLASS, type CareTaskKind, type FinishClass } from "./vocabulary";

export const CAUTION_KEYS = [
  "oily_rags",
  "fine_dust",
  "epoxy_skin",
  "polishing_heat",
  "heat_on_resin",
  "ventilation",
  "product_label",
  "heavy_top",
  "electrics",
] as const;
export type CautionKey = (typeof CAUTION_KEYS)[number];

export interface Caution {
  key: CautionKey;
  title: string;
  text: string;
  /** One short sentence, for a printed drawer card. */
  short: string;
}

/**
 * Our words, after these sources:
 * - oily_rags: NFPA tip sheet "Safety with oily rags" (dry spread out flat outdoors, or a metal can
 *   filled with water and detergent, lid on, kept cool; then the local waste service).
 * - fine_dust: wood dust and char dust are fine particles; a mask rated for fine dust (FFP2 under
 *   EN 149, N95 under 42 CFR 84) is the usual advice of finish makers' safety data sheets.
 * - epoxy_skin: epoxy resin and hardener safety data sheets (skin sensitiser; nitrile gloves, no
 *   solvent on skin).
 * - polishing_heat, heat_on_resin: cured epoxy softens as it nears its heat-deflection temperature,
 *   which makers of tabletop resins print on their data sheets; common practice, no published source
 *   for the everyday examples.
 * - heavy_top, electrics: two people to lift; licensed trades and local codes (common practice, no published source).
 */
export const CAUTIONS: Record<CautionKey, Omit<Caution, "key">> = {
  oily_rags: {
    title: "Oily rags can catch fire by themselves",
    text:
      "Cloths, pads and brushes wet with oil heat up as the oil dries and can catch fire on their own within hours. Never pile them up or drop them in a bin. " +
      "Dry them spread out flat outdoors, away from the house, or put them in a metal can, cover them with water and a squirt of washing-up detergent, close the lid tightly and keep the can somewhere cool and out of the sun. " +
      "Then ask your local waste service how to get rid of them.",
    short: "Oily rags can catch fire by themselves: dry them flat outdoors, or keep them in a closed metal can of water with a little detergent, stored somewhere cool.",
  },
  fine_dust: {
    title: "Wear a mask for sanding and char dust",
    text:
      "Sanding, scuffing a finish and brushing loose char raise fine dust that goes deep into the lungs. Wear a well-fitting mask rated for fine dust (FFP2 or N95), " +
      "work with windows open or outdoors, and clean up with a vacuum or a damp cloth rather than a broom.",
    short: "Sanding, scuffing or brushing char: wear a mask rated for fine dust (FFP2 or N95).",
  },
  epoxy_skin: {
    title: "Keep epoxy and hardener off your skin",
    text:
      "Uncured epoxy resin and its hardener irritate skin and can cause an allergy that lasts. Wear nitrile gloves (not latex) and eye protection, " +
      "and wash any splash off straight away with soap and water — never with a solvent.",
    short: "Epoxy and hardener: wear nitrile gloves and keep them off your skin.",
  },
  polishing_heat: {
    title: "Polish resin gently: friction heats it",
    text: "Hard rubbing or a machine polisher heats resin and can soften, smear or cloud it. Use light pressure, keep the pad moving, work a small area at a time and let it cool.",
    short: "Polish resin gently: friction heat can soften or cloud it.",
  },
  heat_on_resin: {
    title: "Keep heat off the resin",
    text:
      "Resin softens, marks and clouds with heat. Put hot mugs, pots and pans on a mat or trivet, don't leave a laptop or charger running warm on it, " +
      "and keep heaters, fires and grills well away from it.",
    short: "Keep hot mugs, pans, laptops and heaters off and away from the resin.",
  },
  ventilation: {
    title: "Ventilate while you work",
    text: "Open windows and keep air moving while the finish goes on and while it dries. Keep flames, heaters and sparks away from the products and the rags, and children and pets out of the room.",
    short: "Ventilate while a finish goes on and dries.",
  },
  product_label: {
    title: "Read the label and safety data sheet first",
    text: "Follow the product's label and its safety data sheet, including the gloves and eye protection they ask for. Where they differ from this advice, the maker's instructions come first.",
    short: "Follow each product's label and safety data sheet.",
  },
  heavy_top: {
    title: "Tops are heavy",
    text: "Lift or move the piece with two people, never alone, and lift rather than drag it.",
    short: "Tops are heavy: lift with two people.",
  },
  electrics: {
    title: "Electrics are for an electrician",
    text: "Anything electrical in a piece (lights, motorised frames, charging points) is for a licensed electrician, under local codes.",
    short: "Anything electrical in a piece is for a licensed electrician.",
  },
};

/** Tasks that put a product on the piece. */
const APPLYING_TASKS: readonly CareTaskKind[] = ["reoil", "topcoat_refresh", "rewax", "resin_polish", "reoil_charred"];
/** Tasks that scuff or brush the surface and raise fine dust. */
const DUSTY_TASKS: readonly CareTaskKind[] = ["topcoat_refresh", "reoil_charred"];
/** Finish classes whose application on a visit involves sanding (between coats, or the repair's edges). */
const SANDED_WHEN_APPLIED: readonly FinishClass[] = ["film_finish", "epoxy_surface", "ceramic_topcoat", "hardwax_oil"];
const OILY_TASKS: readonly CareTaskKind[] = OIL_FINISH_CLASSES.map((c) => TASK_KIND_BY_FINISH_CLASS[c]);

export interface CautionWork {
  /** Care tasks done: a reminder's task, a job's or visit's tasks, or every task of a piece's guide. */
  tasks?: readonly CareTaskKind[];
  /** Finish classes applied: new layers, products brought to a visit. */
  applying?: readonly FinishClass[];
  /** The piece has resin (any resin kind but none, or an epoxy surface layer). */
  hasResin?: boolean;
  /** An owner at home, or a technician on a visit (adds lifting and electrics, drops the everyday heat note). */
  audience: "owner" | "technician";
}

/** The cautions for this work, each once, in the catalogue's order. */
export function cautionsFor(work: CautionWork): Caution[] {
  const tasks = work.tasks ?? [];
  const applying = work.applying ?? [];
  const has = (t: readonly CareTaskKind[]) => tasks.some((k) => t.includes(k));
  const keys = new Set<CautionKey>();
  const putsProductOn = has(APPLYING_TASKS) || applying.length > 0;
  if (has(OILY_TASKS) || applying.some((c) => OIL_FINISH_CLASSES.includes(c))) keys.add("oily_rags");
  if (has(DUSTY_TASKS) || (work.audience === "technician" && applying.some((c) => SANDED_WHEN_APPLIED.includes(c))) || applying.includes("charred_oiled")) {
    keys.add("fine_dust");
  }
  if (applying.includes("epoxy_surface")) keys.add("epoxy_skin");
  if (tasks.includes("resin_polish") || (work.audience === "technician" && work.hasResin && putsProductOn)) keys.add("polishing_heat");
  if (work.hasResin && work.audience === "owner") keys.add("heat_on_resin");
  if (putsProductOn) {
    keys.add("ventilation");
    keys.add("product_label");
  }
  if (work.audience === "technician" || tasks.includes("annual_check")) keys.add("heavy_top");
  if (work.audience === "technician") keys.add("electrics");
  return CAUTION_KEYS.filter((k) => keys.has(k)).map((key) => ({ key, ...CAUTIONS[key] }));
}

/** One line per caution ("Title. Text"), for plain-text places: the drawer card, e-mails. */
export function cautionLine(c: Caution): string {
  return `${c.title}. ${c.text}`;
}
