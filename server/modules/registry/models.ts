import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
} from 'sequelize';
import { INSTRUMENT_FAMILIES, OWNER_KINDS, type InstrumentFamily, type OwnerKind } from '../../../shared/domain.js';
import { normalizeMaker, normalizeSerial } from '../../../shared/serial.js';
import { sequelize } from '../../lib/db.js';
import { idColumn, networkIdColumn, oneOf, optionalRefColumn, refColumn } from '../../lib/columns.js';

export const CUSTOMER_KINDS = ['person', 'school', 'fleet'] as const;
export type CustomerKind = (typeof CUSTOMER_KINDS)[number];

export const INSTRUMENT_STATUSES = ['in_service', 'in_shop', 'in_transit', 'retired'] as const;
export type InstrumentStatus = (typeof INSTRUMENT_STATUSES)[number];

/** A player, a school or the network's own rental fleet. Contact details are shown per home shop. */
export class Customer extends Model<InferAttributes<Customer>, InferCreationAttributes<Customer>> {
  declare id: CreationOptional<string>;
  declare networkId: string;
  declare kind: CustomerKind;
  declare name: string;
  declare contactName: CreationOptional<string | null>;
  declare email: CreationOptional<string | null>;
  declare phone: CreationOptional<string | null>;
  declare address: CreationOptional<string | null>;
  declare homeShopId: CreationOptional<string | null>;
  declare notes: CreationOptional<string | null>;
  /** Schools and fleets: printed on estimates and invoices. */
  declare poNumber: CreationOptional<string | null>;
  declare taxExemptCertificate: CreationOptional<string | null>;
  /** No notices by e-mail (estimate approval requests still go out). */
  declare noticesOptOut: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  declare instruments?: NonAttribute<Instrument[]>;
}

Customer.init(
  {
    id: idColumn(),
    networkId: networkIdColumn(),
    kind: { type: DataTypes.TEXT, allowNull: false, validate: oneOf(CUSTOMER_KINDS) },
    name: { type: DataTypes.TEXT, allowNull: false },
    contactName: DataTypes.TEXT,
    email: DataTypes.TEXT,
    phone: DataTypes.TEXT,
    address: DataTypes.TEXT,
    homeShopId: optionalRefColumn(),
    notes: DataTypes.TEXT,
    poNumber: DataTypes.TEXT,
    taxExemptCertificate: DataTypes.TEXT,
    noticesOptOut: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, modelName: 'Customer', tableName: 'customers', underscored: true },
);

/**
 * One instrument in the registry. Setting `serial` or `maker` also sets the normalised forms that
 * search and the uniqueness rule use (shared/serial.ts), so no caller can forget them.
 */
export class Instrument extends Model<InferAttributes<Instrument>, InferCreationAttributes<Instrument>> {
  declare id: CreationOptional<string>;
  declare networkId: string;
  declare family: InstrumentFamily;
  declare maker: string;
  declare model: CreationOptional<string | null>;
  declare serial: string;
  declare serialNormalized: CreationOptional<string>;
  declare makerNormalized: CreationOptional<string>;
  declare ownerKind: OwnerKind;
  declare ownerCustomerId: CreationOptional<string | null>;
  declare currentShopId: string;
  declare status: CreationOptional<InstrumentStatus>;
  declare assetTag: CreationOptional<string | null>;
  declare yearMade: CreationOptional<number | null>;
  declare notes: CreationOptional<string | null>;
  /** Set at the desk when this instrument travels in a heavy case whatever its family (a double case, a flight case). */
  declare heavyCase: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  declare ownerCustomer?: NonAttribute<Customer>;
  declare history?: NonAttribute<HistoryEvent[]>;
}

Instrument.init(
  {
    id: idColumn(),
    networkId: networkIdColumn(),
    family: { type: DataTypes.TEXT, allowNull: false, validate: oneOf(INSTRUMENT_FAMILIES) },
    maker: {
      type: DataTypes.TEXT,
      allowNull: false,
      set(value: string) {
        this.setDataValue('maker', value.trim());
        this.setDataValue('makerNormalized', normalizeMaker(value));
      },
    },
    model: DataTypes.TEXT,
    serial: {
      type: DataTypes.TEXT,
      allowNull: false,
      set(value: string) {
        this.setDataValue('serial', value.trim());
        this.setDataValue('serialNormalized', normalizeSerial(value));
      },
    },
    serialNormalized: { type: DataTypes.TEXT, allowNull: false, validate: { notEmpty: true } },
    makerNormalized: { type: DataTypes.TEXT, allowNull: false },
    ownerKind: { type: DataTypes.TEXT, allowNull: false, validate: oneOf(OWNER_KINDS) },
    ownerCustomerId: optionalRefColumn(),
    currentShopId: refColumn(),
    status: {
      type: DataTypes.TEXT,
      allowNull: false,
      defaultValue: 'in_shop',
      validate: oneOf(INSTRUMENT_STATUSES),
    },
    assetTag: DataTypes.TEXT,
    yearMade: DataTypes.INTEGER,
    notes: DataTypes.TEXT,
    heavyCase: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, modelName: 'Instrument', tableName: 'instruments', underscored: true },
);

/**
 * One entry in a serial's timeline across all shops. Append-only (no updated_at); `idempotencyKey`
 * lets a retried worker step write the same event without doubling it.
 */
export class HistoryEvent extends Model<InferAttributes<HistoryEvent>, InferCreationAttributes<HistoryEvent>> {
  declare id: CreationOptional<string>;
  declare networkId: string;
  declare instrumentId: string;
  declare jobId: CreationOptional<string | null>;
  declare shopId: CreationOptional<string | null>;
  declare userId: CreationOptional<string | null>;
  /** intake, job_opened, stage_changed, transfer_requested, transfer_approved, transfer_packed, transfer_departed, note, … */
  declare kind: string;
  declare summary: string;
  declare data: CreationOptional<Record<string, unknown>>;
  declare occurredAt: CreationOptional<Date>;
  declare idempotencyKey: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;

  declare instrument?: NonAttribute<Instrument>;
}

HistoryEvent.init(
  {
    id: idColumn(),
    networkId: networkIdColumn(),
    instrumentId: refColumn(),
    jobId: optionalRefColumn(),
    shopId: optionalRefColumn(),
    userId: optionalRefColumn(),
    kind: { type: DataTypes.TEXT, allowNull: false },
    summary: { type: DataTypes.TEXT, allowNull: false },
    data: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
    occurredAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
    idempotencyKey: DataTypes.TEXT,
    createdAt: DataTypes.DATE,
  },
  { sequelize, modelName: 'HistoryEvent', tableName: 'history_events', underscored: true, updatedAt: false },
);

const rel = { constraints: false } as const;
Customer.hasMany(Instrument, { ...rel, as: 'instruments', foreignKey: 'ownerCustomerId', sourceKey: 'id' });
Instrument.belongsTo(Customer, { ...rel, as: 'ownerCustomer', foreignKey: 'ownerCustomerId', targetKey: 'id' });
Instrument.hasMany(HistoryEvent, { ...rel, as: 'history', foreignKey: 'instrumentId', sourceKey: 'id' });
HistoryEvent.belongsTo(Instrument, { ...rel, as: 'instrument', foreignKey: 'instrumentId', targetKey: 'id' });
