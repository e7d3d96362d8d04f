import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
} from 'sequelize';
import { sequelize } from '../../lib/db.js';
import { idColumn, networkIdColumn, oneOf, optionalRefColumn, refColumn } from '../../lib/columns.js';

export const UNIT_SYSTEMS = ['mm', 'in'] as const;
export type UnitSystem = (typeof UNIT_SYSTEMS)[number];

/**
 * Per-key pad cup measurements and the pads chosen for them. Values inside `entries` and `results`
 * are millimetres; `unitSystem` only remembers what the technician typed in. Their shape is owned by
 * the pad map computation in shared/.
 */
export class PadMap extends Model<InferAttributes<PadMap>, InferCreationAttributes<PadMap>> {
  declare id: CreationOptional<string>;
  declare networkId: string;
  declare instrumentId: string;
  declare jobId: CreationOptional<string | null>;
  /** The shop where the pad cups were measured. */
  declare shopId: string;
  declare unitSystem: UnitSystem;
  declare entries: Array<Record<string, unknown>>;
  declare results: CreationOptional<Array<Record<string, unknown>>>;
  declare createdByUserId: string;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

PadMap.init(
  {
    id: idColumn(),
    networkId: networkIdColumn(),
    instrumentId: refColumn(),
    jobId: optionalRefColumn(),
    shopId: refColumn(),
    unitSystem: { type: DataTypes.TEXT, allowNull: false, validate: oneOf(UNIT_SYSTEMS) },
    entries: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
    results: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
    createdByUserId: refColumn(),
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, modelName: 'PadMap', tableName: 'pad_maps', underscored: true },
);
