/**
 * Safety cautions for bench work named in a service or line item. They are reminders, not
 * instructions: each defers to the product's safety data sheet, local codes and licensed practice.
 * Matching on words is deliberately broad — a caution shown once too often costs less than one missed.
 */

const DEFER = "Follow the product's safety data sheet, local codes and licensed practice.";

const RULES: Array<{ words: RegExp; caution: string }> = [
  {
    words: /\b(repad|pad|pads|overhaul|cement|glue|adhesive|cyanoacrylate)\b/i,
    caution: `Adhesives and heat: pad cement and glued pads are set with heat, cyanoacrylate and its debonders give off irritating vapours — ventilate, keep flame away from solvents, protect eyes and skin. ${DEFER}`,
  },
  {
    words: /\b(chemical|clean|cleaning|solvent|lacquer|strip|acid)\b/i,
    caution: `Solvents and cleaning chemicals: wear gloves and eye protection, ventilate, keep away from flame, store and dispose as labelled. ${DEFER}`,
  },
  {
    words: /\b(dent|buff|buffing|polish|abrasive|grind|disc)\b/i,
    caution: `Abrasives and dent tools: wear eye protection, secure the work, keep hands clear of rotary tools. ${DEFER}`,
  },
  {
    words: /\b(baritone|tuba|sousaphone|euphonium)\b/i,
    caution: `Heavy instrument: lift the case with bent knees and get help with a full baritone saxophone or tuba case. ${DEFER}`,
  },
];

export function cautionsFor(...texts: Array<string | null | undefined>): string[] {
  const text = texts.filter(Boolean).join(' ');
  return RULES.filter((r) => r.words.test(text)).map((r) => r.caution);
}
