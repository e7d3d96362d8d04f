import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
} from 'sequelize';
import { NOTIFICATION_KINDS, type NotificationKind } from '../../../shared/domain.js';
import { sequelize } from '../../lib/db.js';
import { idColumn, networkIdColumn, oneOf, refColumn } from '../../lib/columns.js';

/** An entry in a person's in-app inbox. */
export class Notification extends Model<InferAttributes<Notification>, InferCreationAttributes<Notification>> {
  declare id: CreationOptional<string>;
  declare networkId: string;
  declare userId: string;
  declare kind: NotificationKind;
  declare title: string;
  declare body: CreationOptional<string>;
  /** In-app path, e.g. /jobs/…; never an absolute URL. */
  declare link: CreationOptional<string | null>;
  declare readAt: CreationOptional<Date | null>;
  /** Same key from a retried worker step → same row; nobody is told twice. */
  declare dedupeKey: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;
}

Notification.init(
  {
    id: idColumn(),
    networkId: networkIdColumn(),
    userId: refColumn(),
    kind: { type: DataTypes.TEXT, allowNull: false, validate: oneOf(NOTIFICATION_KINDS) },
    title: { type: DataTypes.TEXT, allowNull: false },
    body: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    link: DataTypes.TEXT,
    readAt: DataTypes.DATE,
    dedupeKey: DataTypes.TEXT,
    createdAt: DataTypes.DATE,
  },
  { sequelize, modelName: 'Notification', tableName: 'notifications', underscored: true, updatedAt: false },
);

/** Whether a person also wants a kind of notice by e-mail (the in-app inbox always gets it). */
export class NotificationPreference extends Model<
  InferAttributes<NotificationPreference>,
  InferCreationAttributes<NotificationPreference>
> {
  declare networkId: string;
  declare userId: string;
  declare kind: NotificationKind;
  declare email: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

NotificationPreference.init(
  {
    networkId: networkIdColumn(),
    userId: { type: DataTypes.UUID, allowNull: false, primaryKey: true },
    kind: { type: DataTypes.TEXT, allowNull: false, primaryKey: true, validate: oneOf(NOTIFICATION_KINDS) },
    email: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, modelName: 'NotificationPreference', tableName: 'notification_preferences', underscored: true },
);

/**
 * A message to send (e-mail), written in the same transaction as the change that caused it and
 * sent afterwards; `dedupeKey` makes a retried step enqueue it once.
 */
export class OutboxMessage extends Model<InferAttributes<OutboxMessage>, InferCreationAttributes<OutboxMessage>> {
  declare id: CreationOptional<string>;
  declare networkId: string;
  declare kind: string;
  declare dedupeKey: string;
  declare payload: Record<string, unknown>;
  declare attempts: CreationOptional<number>;
  declare lastError: CreationOptional<string | null>;
  declare sentAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
}

OutboxMessage.init(
  {
    id: idColumn(),
    networkId: networkIdColumn(),
    kind: { type: DataTypes.TEXT, allowNull: false },
    dedupeKey: { type: DataTypes.TEXT, allowNull: false },
    payload: { type: DataTypes.JSONB, allowNull: false },
    attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    lastError: DataTypes.TEXT,
    sentAt: DataTypes.DATE,
    createdAt: DataTypes.DATE,
  },
  { sequelize, modelName: 'OutboxMessage', tableName: 'outbox', underscored: true, updatedAt: false },
);
