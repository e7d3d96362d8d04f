import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
} from 'sequelize';
import { ROLES, type Role } from '../../../shared/domain.js';
import { sequelize } from '../../lib/db.js';
import { decimalColumn, idColumn, networkIdColumn, oneOf, optionalRefColumn, refColumn } from '../../lib/columns.js';

export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
  declare id: CreationOptional<string>;
  declare networkId: string;
  /** Always stored lower-cased (the setter does it), so uniqueness per network is case-insensitive. */
  declare email: string;
  declare name: string;
  declare active: CreationOptional<boolean>;
  /** The identity provider account this person signs in with, bound at first sign-in (issuer + subject). */
  declare oidcIssuer: CreationOptional<string | null>;
  declare oidcSubject: CreationOptional<string | null>;
  declare lastSignInAt: CreationOptional<Date | null>;
  declare deactivatedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  declare memberships?: NonAttribute<Membership[]>;
  declare technicianSkills?: NonAttribute<TechnicianSkill[]>;
}

User.init(
  {
    id: idColumn(),
    networkId: networkIdColumn(),
    email: {
      type: DataTypes.TEXT,
      allowNull: false,
      validate: { isEmail: true },
      set(value: string) {
        this.setDataValue('email', value.trim().toLowerCase());
      },
    },
    name: { type: DataTypes.TEXT, allowNull: false },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    oidcIssuer: DataTypes.TEXT,
    oidcSubject: DataTypes.TEXT,
    lastSignInAt: DataTypes.DATE,
    deactivatedAt: DataTypes.DATE,
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, modelName: 'User', tableName: 'users', underscored: true },
);

/** One role of one person at one shop; the owner role alone is network-wide (shopId null). */
export class Membership extends Model<InferAttributes<Membership>, InferCreationAttributes<Membership>> {
  declare id: CreationOptional<string>;
  declare networkId: string;
  declare userId: string;
  declare shopId: string | null;
  declare role: Role;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  declare user?: NonAttribute<User>;
}

Membership.init(
  {
    id: idColumn(),
    networkId: networkIdColumn(),
    userId: refColumn(),
    shopId: optionalRefColumn(),
    role: { type: DataTypes.TEXT, allowNull: false, validate: oneOf(ROLES) },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  {
    sequelize,
    modelName: 'Membership',
    tableName: 'memberships',
    underscored: true,
    validate: {
      ownerIsNetworkWide(this: Membership) {
        if ((this.role === 'owner') !== (this.shopId == null)) {
          throw new Error('the owner role is network-wide (no shop); every other role names a shop');
        }
      },
    },
  },
);

/** A skill a person brings to the bench at one shop, with the hours a week they give it. */
export class TechnicianSkill extends Model<InferAttributes<TechnicianSkill>, InferCreationAttributes<TechnicianSkill>> {
  declare id: CreationOptional<string>;
  declare networkId: string;
  declare userId: string;
  declare shopId: string;
  declare skillId: string;
  declare weeklyHours: number;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  declare user?: NonAttribute<User>;
}

TechnicianSkill.init(
  {
    id: idColumn(),
    networkId: networkIdColumn(),
    userId: refColumn(),
    shopId: refColumn(),
    skillId: refColumn(),
    weeklyHours: decimalColumn('weeklyHours', 6, 2, false),
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, modelName: 'TechnicianSkill', tableName: 'technician_skills', underscored: true },
);

export interface InvitedRole {
  shopId: string | null;
  role: Role;
}

export class Invitation extends Model<InferAttributes<Invitation>, InferCreationAttributes<Invitation>> {
  declare id: CreationOptional<string>;
  declare networkId: string;
  declare email: string;
  /** Hash of the token sent by e-mail; the token itself is never stored. */
  declare tokenHash: string;
  declare roles: InvitedRole[];
  declare invitedByUserId: string;
  declare expiresAt: Date;
  declare acceptedAt: CreationOptional<Date | null>;
  declare acceptedUserId: CreationOptional<string | null>;
  declare revokedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  declare invitedBy?: NonAttribute<User>;
}

Invitation.init(
  {
    id: idColumn(),
    networkId: networkIdColumn(),
    email: {
      type: DataTypes.TEXT,
      allowNull: false,
      validate: { isEmail: true },
      set(value: string) {
        this.setDataValue('email', value.trim().toLowerCase());
      },
    },
    tokenHash: { type: DataTypes.TEXT, allowNull: false, unique: true },
    roles: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
    invitedByUserId: refColumn(),
    expiresAt: { type: DataTypes.DATE, allowNull: false },
    acceptedAt: DataTypes.DATE,
    acceptedUserId: optionalRefColumn(),
    revokedAt: DataTypes.DATE,
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, modelName: 'Invitation', tableName: 'invitations', underscored: true },
);

/** Who changed what, with the row before and after. Append-only: no updated_at. */
export class AuditLog extends Model<InferAttributes<AuditLog>, InferCreationAttributes<AuditLog>> {
  declare id: CreationOptional<string>;
  declare networkId: string;
  declare actorUserId: string | null;
  declare action: string;
  declare entity: string;
  declare entityId: CreationOptional<string | null>;
  declare before: CreationOptional<Record<string, unknown> | null>;
  declare after: CreationOptional<Record<string, unknown> | null>;
  declare at: CreationOptional<Date>;

  declare actor?: NonAttribute<User>;
}

AuditLog.init(
  {
    id: idColumn(),
    networkId: networkIdColumn(),
    actorUserId: optionalRefColumn(),
    action: { type: DataTypes.TEXT, allowNull: false },
    entity: { type: DataTypes.TEXT, allowNull: false },
    entityId: DataTypes.TEXT,
    before: DataTypes.JSONB,
    after: DataTypes.JSONB,
    at: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
  },
  { sequelize, modelName: 'AuditLog', tableName: 'audit_log', underscored: true, timestamps: false },
);

const rel = { constraints: false } as const;
User.hasMany(Membership, { ...rel, as: 'memberships', foreignKey: 'userId', sourceKey: 'id' });
Membership.belongsTo(User, { ...rel, as: 'user', foreignKey: 'userId', targetKey: 'id' });
User.hasMany(TechnicianSkill, { ...rel, as: 'technicianSkills', foreignKey: 'userId', sourceKey: 'id' });
TechnicianSkill.belongsTo(User, { ...rel, as: 'user', foreignKey: 'userId', targetKey: 'id' });
Invitation.belongsTo(User, { ...rel, as: 'invitedBy', foreignKey: 'invitedByUserId', targetKey: 'id' });
AuditLog.belongsTo(User, { ...rel, as: 'actor', foreignKey: 'actorUserId', targetKey: 'id' });
