import type { QueryInterface } from 'sequelize';

/**
 * Until this step a caution was chosen from words in a service's name. Networks that already have a catalog
 * keep the cautions they saw: each existing item and part gets, once, the tags those words used to trigger.
 * From here on only the owner's tags count; the owner reviews and corrects them on the catalog and stock screens.
 */
const RULES: Array<{ words: string; hazards: string[] }> = [
  { words: 'repad|pads?|overhaul', hazards: ['adhesive', 'heat_flame', 'pad_removal'] },
  { words: 'cement|glue|adhesive|cyanoacrylate', hazards: ['adhesive', 'heat_flame'] },
  { words: 'chemical|clean|cleaning|solvent|lacquer|strip|acid', hazards: ['solvent'] },
  { words: 'dent|buff|buffing|polish|abrasive|grind|disc', hazards: ['abrasive_rotary'] },
  { words: 'baritone|tuba|sousaphone|euphonium', hazards: ['heavy_lift'] },
];

const tagsFor = (table: string) =>
  RULES.map(
    (r) => `update ${table} set hazards = array(select distinct unnest(hazards || array[${r.hazards.map((h) => `'${h}'`).join(', ')}]::text[]) order by 1)
      where name ~* '\\y(${r.words})\\y';`,
  ).join('\n');

export async function up({ context }: { context: QueryInterface }): Promise<void> {
  await context.sequelize.query(`${tagsFor('service_catalog')}\n${tagsFor('parts')}`);
}

export async function down({ context }: { context: QueryInterface }): Promise<void> {
  await context.sequelize.query(`update service_catalog set hazards = '{}'; update parts set hazards = '{}';`);
}
