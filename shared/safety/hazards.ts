import { z } from 'zod';
import type { InstrumentFamily } from '../domain.js';

/**
 * Bench hazards and their cautions: the one place the words live. The owner tags each service-catalog
 * item and each part with the hazards its work carries; a job's cautions are the union of the tags of its
 * lines, plus lifting when the instrument is heavy (its family, or the instrument's own "heavy case" flag).
 * Nothing is guessed from names.
 *
 * The texts are reminders, not instructions. Each work caution defers to the product's safety data sheet,
 * local codes and licensed practice; the lifting caution defers to manual-handling rules and local codes.
 */
export const HAZARDS = [
  'adhesive',
  'solvent',
  'heat_flame',
  'solder_lead',
  'abrasive_rotary',
  'springs_sharp',
  'pad_removal',
  'heavy_lift',
] as const;
export type Hazard = (typeof HAZARDS)[number];

/** Plain labels for the owner's checkboxes and the caution headings. */
export const HAZARD_LABELS: Record<Hazard, string> = {
  adhesive: 'Adhesives (cyanoacrylate, contact cement)',
  solvent: 'Solvents and cleaning chemicals',
  heat_flame: 'Heat or open flame (heat gun, alcohol lamp, hot-melt, shellac)',
  solder_lead: 'Soldering (torch, flux, lead in old solder)',
  abrasive_rotary: 'Abrasives and rotary tools',
  springs_sharp: 'Springs and sharp points',
  pad_removal: 'Removing old pads and cleaning pad cups',
  heavy_lift: 'Heavy lift',
};

export const SDS_DEFERRAL = "Follow the product's safety data sheet, local codes and licensed practice; they come first.";

/** One lifting text everywhere: intake, hand-back, packing, receiving, notices, e-mails and the manifest. */
export const LIFTING_CAUTION =
  'Heavy case: lift it with two people or move it on a cart, keep it close to your body and do not twist while ' +
  'carrying. Follow your workplace manual-handling rules and local codes; they take precedence over this note.';

export const HAZARD_CAUTIONS: Record<Hazard, string> = {
  adhesive:
    'Cyanoacrylate bonds skin and eyelids in seconds, its vapour irritates eyes and airways, and a drop or its ' +
    'debonder mars lacquer: keep it off the finish, wear eye protection and nitrile gloves, and keep debonder at hand. ' +
    'Contact cement gives off solvent fumes that are harmful to breathe and catch fire easily: ventilate and keep ' +
    `flame and heat guns away until it has dried. ${SDS_DEFERRAL}`,
  solvent:
    'Solvents and cleaning chemicals irritate skin and eyes, some strip lacquer and many are flammable: wear gloves ' +
    `and eye protection, ventilate, keep them away from flame, cap them after use and dispose of them as labelled. ${SDS_DEFERRAL}`,
  heat_flame:
    'Hot-melt pad cement and shellac stick to skin and burn deeply; an alcohol-lamp flame is hard to see in daylight, ' +
    'and a tipped lamp spreads burning spirit: stand the lamp where it cannot be knocked over, refill it only cold and ' +
    'away from flame, work on a heat-proof surface, let keys cool before handling, and keep an extinguisher within ' +
    `reach. ${SDS_DEFERRAL}`,
  solder_lead:
    'Brass work with a torch: fire and burn risk, and flux fumes irritate the airways — use extraction and keep ' +
    'solvents and rags away. Old solder may contain lead: do not eat or drink at the bench, wash your hands after ' +
    `the work, and collect filings and dross for proper disposal. ${SDS_DEFERRAL}`,
  abrasive_rotary:
    'Abrasive discs and buffing wheels throw fragments and can catch the work: wear eye protection, keep guards in ' +
    `place, secure the work, keep hands and loose clothing clear, and wear a dust mask where dust rises. ${SDS_DEFERRAL}`,
  springs_sharp:
    'Needle springs are sharp at the point and flat springs can slip and fly when unhooked or bent: wear eye ' +
    `protection, use a spring hook rather than fingers, and point the spring away from your face. ${SDS_DEFERRAL}`,
  pad_removal:
    'Removing old pads and cleaning pad cups means heat on the key, debonder on old glue and solvent in the cup: ' +
    `wear gloves and eye protection, ventilate, and keep the flame away from debonder and solvents. ${SDS_DEFERRAL}`,
  heavy_lift: LIFTING_CAUTION,
};

export interface HazardCaution {
  hazard: Hazard;
  title: string;
  text: string;
}

/** The cautions for a set of hazards, each once, in the fixed order of HAZARDS. */
export function cautionsFor(hazards: Iterable<Hazard>): HazardCaution[] {
  const set = new Set(hazards);
  return HAZARDS.filter((h) => set.has(h)).map((h) => ({ hazard: h, title: HAZARD_LABELS[h], text: HAZARD_CAUTIONS[h] }));
}

/** Tags from the owner, stored sorted and without repeats. */
export function normaliseHazards(hazards: Iterable<Hazard>): Hazard[] {
  const set = new Set(hazards);
  return HAZARDS.filter((h) => set.has(h));
}

/**
 * Families whose cases are heavy or bulky enough that every lift deserves the caution. From memory, not from a
 * published source: a baritone or bass saxophone, a tuba (a sousaphone is recorded as a tuba) or a euphonium in
 * its hard case weighs roughly 10–25 kg and is long or wide enough that one person cannot keep it close to the
 * body. A bass clarinet or a trombone is lighter and compact enough to carry alone; an instrument that comes in a
 * heavy case anyway (a double case, a flight case) gets the instrument's own "heavy case" flag.
 */
export const HEAVY_CASE_FAMILIES: readonly InstrumentFamily[] = ['baritone_saxophone', 'bass_saxophone', 'tuba', 'euphonium'];

/** Lifting applies when the family is heavy or the instrument is flagged. */
export function isHeavyCase(family: InstrumentFamily, heavyCaseFlag = false): boolean {
  return heavyCaseFlag || HEAVY_CASE_FAMILIES.includes(family);
}

/** The owner's tags in a request: unknown names are refused on the field itself ("hazards"), repeats dropped. */
export const hazardsSchema = z
  .array(z.string({ error: 'Choose hazards from the list.' }), { error: 'Choose hazards from the list.' })
  .max(50, 'Choose hazards from the list.')
  .superRefine((list, ctx) => {
    const unknown = list.filter((h) => !(HAZARDS as readonly string[]).includes(h));
    if (unknown.length) ctx.addIssue({ code: 'custom', message: `Not a hazard Benchrelay knows: ${unknown.join(', ')}. Choose from the list.` });
  })
  .transform((list) => normaliseHazards(list as Hazard[]));
