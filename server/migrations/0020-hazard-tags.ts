import type { QueryInterface } from 'sequelize';

/**
 * Hazard tags set by the owner on service-catalog items and parts (shared/safety/hazards.ts lists them), a
 * per-instrument "heavy case" flag, and the bass saxophone as a family of its own (its case is among the heaviest
 * a shop lifts). The lists are written out here, not imported, so this step stays what it was when applied.
 */
const HAZARDS = ['adhesive', 'solvent', 'heat_flame', 'solder_lead', 'abrasive_rotary', 'springs_sharp', 'pad_removal', 'heavy_lift'];
const FAMILIES_BEFORE = [
  'alto_saxophone', 'tenor_saxophone', 'baritone_saxophone', 'soprano_saxophone',
  'flute', 'piccolo', 'clarinet', 'bass_clarinet', 'oboe', 'bassoon',
  'trumpet', 'trombone', 'french_horn', 'euphonium', 'tuba', 'other',
];
const FAMILIES_AFTER = [...FAMILIES_BEFORE.slice(0, 3), 'bass_saxophone', ...FAMILIES_BEFORE.slice(3)];

const list = (values: string[]) => values.map((v) => `'${v}'`).join(', ');
const hazardCheck = (table: string) =>
  `alter table ${table} add column hazards text[] not null default '{}'
     constraint ${table}_hazards_check check (hazards <@ array[${list(HAZARDS)}]::text[]);`;
const familyChecks = (families: string[]) => `
alter table instruments drop constraint if exists instruments_family_check;
alter table instruments add constraint instruments_family_check check (family in (${list(families)}));
alter table service_catalog drop constraint if exists service_catalog_family_check;
alter table service_catalog add constraint service_catalog_family_check check (family in (${list(families)}));
`;

const upSql = `
${hazardCheck('service_catalog')}
${hazardCheck('parts')}
alter table instruments add column heavy_case boolean not null default false;
${familyChecks(FAMILIES_AFTER)}
`;

const downSql = `
update instruments set family = 'other' where family = 'bass_saxophone';
update service_catalog set family = null where family = 'bass_saxophone';
${familyChecks(FAMILIES_BEFORE)}
alter table instruments drop column if exists heavy_case;
alter table parts drop column if exists hazards;
alter table service_catalog drop column if exists hazards;
`;

export async function up({ context }: { context: QueryInterface }): Promise<void> {
  await context.sequelize.query(upSql);
}

export async function down({ context }: { context: QueryInterface }): Promise<void> {
  await context.sequelize.query(downSql);
}
