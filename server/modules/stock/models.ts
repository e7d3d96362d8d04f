import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
} from 'sequelize';
import { sequelize } from '../../lib/db.js';
import { decimalColumn, idColumn, networkIdColumn, oneOf, refColumn } from '../../lib/columns.js';

export const PART_KINDS = ['pad', 'other'] as const;
export type PartKind = (typeof PART_KINDS)[number];
export const PAD_KINDS = ['self_leveling', 'glued'] as const;
export type PadKind = (typeof PAD_KINDS)[number];

/** A stocked part. Pads carry their kind, diameter and thickness (mm) so a pad map can pick them. */
export class Part extends Model<InferAttributes<Part>, InferCreationAttributes<Part>> {
  declare id: CreationOptional<string>;
  declare networkId: string;
  declare sku: string;
  declare name: string;
  declare kind: PartKind;
  declare padKind: CreationOptional<PadKind | null>;
  declare diameterMm: CreationOptional<number | null>;
  declare thicknessMm: CreationOptional<number | null>;
  declare unitPriceCents: number;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  declare stockLevels?: NonAttribute<StockLevel[]>;
}

Part.init(
  {
    id: idColumn(),
    networkId: networkIdColumn(),
    sku: { type: DataTypes.TEXT, allowNull: false },
    name: { type: DataTypes.TEXT, allowNull: false },
    kind: { type: DataTypes.TEXT, allowNull: false, validate: oneOf(PART_KINDS) },
    padKind: { type: DataTypes.TEXT, validate: oneOf(PAD_KINDS) },
    diameterMm: decimalColumn('diameterMm', 6, 2),
    thicknessMm: decimalColumn('thicknessMm', 5, 2),
    unitPriceCents: { type: DataTypes.INTEGER, allowNull: false, validate: { min: 0 } },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, modelName: 'Part', tableName: 'parts', underscored: true },
);

/** Count of one part at one shop. `reserved` may exceed `onHand`: the difference is a shortage. */
export class StockLevel extends Model<InferAttributes<StockLevel>, InferCreationAttributes<StockLevel>> {
  declare networkId: string;
  declare shopId: string;
  declare partId: string;
  declare onHand: CreationOptional<number>;
  declare reserved: CreationOptional<number>;
  declare reorderPoint: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  declare part?: NonAttribute<Part>;
}

StockLevel.init(
  {
    networkId: networkIdColumn(),
    shopId: { type: DataTypes.UUID, allowNull: false, primaryKey: true },
    partId: { type: DataTypes.UUID, allowNull: false, primaryKey: true },
    onHand: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0, validate: { min: 0 } },
    reserved: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0, validate: { min: 0 } },
    reorderPoint: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0, validate: { min: 0 } },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, modelName: 'StockLevel', tableName: 'stock_levels', underscored: true },
);

/** Parts held for a job at a shop until used or released. */
export class StockReservation extends Model<InferAttributes<StockReservation>, InferCreationAttributes<StockReservation>> {
  declare id: CreationOptional<string>;
  declare networkId: string;
  declare jobId: string;
  declare shopId: string;
  declare partId: string;
  declare quantity: number;
  declare releasedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  declare part?: NonAttribute<Part>;
}

StockReservation.init(
  {
    id: idColumn(),
    networkId: networkIdColumn(),
    jobId: refColumn(),
    shopId: refColumn(),
    partId: refColumn(),
    quantity: { type: DataTypes.INTEGER, allowNull: false, validate: { min: 1 } },
    releasedAt: DataTypes.DATE,
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, modelName: 'StockReservation', tableName: 'stock_reservations', underscored: true },
);

const rel = { constraints: false } as const;
Part.hasMany(StockLevel, { ...rel, as: 'stockLevels', foreignKey: 'partId', sourceKey: 'id' });
StockLevel.belongsTo(Part, { ...rel, as: 'part', foreignKey: 'partId', targetKey: 'id' });
StockReservation.belongsTo(Part, { ...rel, as: 'part', foreignKey: 'partId', targetKey: 'id' });
