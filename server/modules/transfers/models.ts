import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
} from 'sequelize';
import { TRANSFER_STATES, type TransferState } from '../../../shared/domain.js';
import { sequelize } from '../../lib/db.js';
import { idColumn, networkIdColumn, oneOf, optionalRefColumn, refColumn } from '../../lib/columns.js';

/** A job and its instrument moving from one shop to another. At most one unfinished transfer per job. */
export class Transfer extends Model<InferAttributes<Transfer>, InferCreationAttributes<Transfer>> {
  declare id: CreationOptional<string>;
  declare networkId: string;
  declare jobId: string;
  declare instrumentId: string;
  declare fromShopId: string;
  declare toShopId: string;
  declare state: CreationOptional<TransferState>;
  declare reason: string;
  declare requestedByUserId: string;
  /** The manager who decided, whether the decision was to approve or to reject. */
  declare approvedByUserId: CreationOptional<string | null>;
  declare packedByUserId: CreationOptional<string | null>;
  declare receivedByUserId: CreationOptional<string | null>;
  declare relayRunId: CreationOptional<string | null>;
  declare decisionNote: CreationOptional<string | null>;
  declare requestedAt: CreationOptional<Date>;
  declare approvedAt: CreationOptional<Date | null>;
  declare packedAt: CreationOptional<Date | null>;
  /** When the origin handed it over; on a relay run it then waits for the run's departure (`departedAt`). */
  declare handedOverAt: CreationOptional<Date | null>;
  declare departedAt: CreationOptional<Date | null>;
  declare expectedArrivalAt: CreationOptional<Date | null>;
  declare receivedAt: CreationOptional<Date | null>;
  /** Recorded at the pack step for the manifest. */
  declare caseCount: CreationOptional<number | null>;
  declare contents: CreationOptional<string | null>;
  declare departureCondition: CreationOptional<string | null>;
  /** Object key of the manifest PDF. */
  declare manifestKey: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

Transfer.init(
  {
    id: idColumn(),
    networkId: networkIdColumn(),
    jobId: refColumn(),
    instrumentId: refColumn(),
    fromShopId: refColumn(),
    toShopId: refColumn(),
    state: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'requested', validate: oneOf(TRANSFER_STATES) },
    reason: { type: DataTypes.TEXT, allowNull: false },
    requestedByUserId: refColumn(),
    approvedByUserId: optionalRefColumn(),
    packedByUserId: optionalRefColumn(),
    receivedByUserId: optionalRefColumn(),
    relayRunId: optionalRefColumn(),
    decisionNote: DataTypes.TEXT,
    requestedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
    approvedAt: DataTypes.DATE,
    packedAt: DataTypes.DATE,
    handedOverAt: DataTypes.DATE,
    departedAt: DataTypes.DATE,
    expectedArrivalAt: DataTypes.DATE,
    receivedAt: DataTypes.DATE,
    caseCount: DataTypes.INTEGER,
    contents: DataTypes.TEXT,
    departureCondition: DataTypes.TEXT,
    manifestKey: DataTypes.TEXT,
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, modelName: 'Transfer', tableName: 'transfers', underscored: true },
);
