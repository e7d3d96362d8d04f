import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
} from 'sequelize';
import { sequelize } from '../../lib/db.js';
import type { Hazard } from '../../../shared/safety/hazards.js';
import { decimalColumn, hazardsColumn, idColumn, networkIdColumn, oneOf, optionalRefColumn, refColumn } from '../../lib/columns.js';

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
  /** Set by the owner: the hazards of using this part (pad cement: adhesive and heat), shown on the job's line. */
  declare hazards: CreationOptional<Hazard[]>;
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
    hazards: hazardsColumn(),
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

export const PART_TRANSFER_STATES = ['requested', 'sent', 'received', 'cancelled'] as const;
export type PartTransferState = (typeof PART_TRANSFER_STATES)[number];

/** Parts one shop sends another on a relay run, usually because a pad map left the other short. */
export class PartTransfer extends Model<InferAttributes<PartTransfer>, InferCreationAttributes<PartTransfer>> {
  declare id: CreationOptional<string>;
  declare networkId: string;
  declare partId: string;
  declare fromShopId: string;
  declare toShopId: string;
  declare jobId: CreationOptional<string | null>;
  declare quantity: number;
  declare state: CreationOptional<PartTransferState>;
  declare relayRunId: CreationOptional<string | null>;
  declare note: CreationOptional<string | null>;
  declare requestedByUserId: string;
  declare sentByUserId: CreationOptional<string | null>;
  declare receivedByUserId: CreationOptional<string | null>;
  declare cancelledByUserId: CreationOptional<string | null>;
  declare requestedAt: CreationOptional<Date>;
  declare sentAt: CreationOptional<Date | null>;
  declare receivedAt: CreationOptional<Date | null>;
  declare cancelledAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  declare part?: NonAttribute<Part>;
}

PartTransfer.init(
  {
    id: idColumn(),
    networkId: networkIdColumn(),
    partId: refColumn(),
    fromShopId: refColumn(),
    toShopId: refColumn(),
    jobId: optionalRefColumn(),
    quantity: { type: DataTypes.INTEGER, allowNull: false, validate: { min: 1 } },
    state: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'requested', validate: oneOf(PART_TRANSFER_STATES) },
    relayRunId: optionalRefColumn(),
    note: DataTypes.TEXT,
    requestedByUserId: refColumn(),
    sentByUserId: optionalRefColumn(),
    receivedByUserId: optionalRefColumn(),
    cancelledByUserId: optionalRefColumn(),
    requestedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
    sentAt: DataTypes.DATE,
    receivedAt: DataTypes.DATE,
    cancelledAt: DataTypes.DATE,
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, modelName: 'PartTransfer', tableName: 'part_transfers', underscored: true },
);
PartTransfer.belongsTo(Part, { ...rel, as: 'part', foreignKey: 'partId', targetKey: 'id' });
