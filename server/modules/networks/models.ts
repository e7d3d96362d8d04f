import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
} from 'sequelize';
import type { IsoWeekday } from '../../../shared/domain.js';
import { sequelize } from '../../lib/db.js';
import { decimalColumn, idColumn, networkIdColumn, refColumn } from '../../lib/columns.js';

/** One tenant: a company and its shops. Not itself a tenant row, so it has a plain primary key. */
export class Network extends Model<InferAttributes<Network>, InferCreationAttributes<Network>> {
  declare id: CreationOptional<string>;
  declare name: string;
  declare slug: string;
  declare settings: CreationOptional<Record<string, unknown>>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  declare shops?: NonAttribute<Shop[]>;
}

Network.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    name: { type: DataTypes.TEXT, allowNull: false },
    slug: { type: DataTypes.TEXT, allowNull: false, unique: true },
    settings: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, modelName: 'Network', tableName: 'networks', underscored: true },
);

export class Shop extends Model<InferAttributes<Shop>, InferCreationAttributes<Shop>> {
  declare id: CreationOptional<string>;
  declare networkId: string;
  declare name: string;
  /** Short code shown on labels and job numbers, e.g. SEA. */
  declare code: string;
  declare addressLine: CreationOptional<string | null>;
  declare city: CreationOptional<string | null>;
  declare region: CreationOptional<string | null>;
  declare postalCode: CreationOptional<string | null>;
  declare country: CreationOptional<string>;
  declare latitude: CreationOptional<number | null>;
  declare longitude: CreationOptional<number | null>;
  /** IANA time zone name; dates are stored in UTC and shown in this zone. */
  declare timeZone: string;
  declare openingDays: CreationOptional<IsoWeekday[]>;
  declare laborRateCents: number;
  /** 825 = 8.25 %. */
  declare taxRateBasisPoints: CreationOptional<number>;
  declare phone: CreationOptional<string | null>;
  declare email: CreationOptional<string | null>;
  declare active: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  declare network?: NonAttribute<Network>;
  declare shopSkills?: NonAttribute<ShopSkill[]>;
  declare outgoingRuns?: NonAttribute<RelayRun[]>;
}

Shop.init(
  {
    id: idColumn(),
    networkId: networkIdColumn(),
    name: { type: DataTypes.TEXT, allowNull: false },
    code: { type: DataTypes.TEXT, allowNull: false, validate: { is: /^[A-Z0-9]{2,8}$/ } },
    addressLine: DataTypes.TEXT,
    city: DataTypes.TEXT,
    region: DataTypes.TEXT,
    postalCode: DataTypes.TEXT,
    country: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'US' },
    latitude: decimalColumn('latitude', 9, 6),
    longitude: decimalColumn('longitude', 9, 6),
    timeZone: { type: DataTypes.TEXT, allowNull: false },
    openingDays: { type: DataTypes.ARRAY(DataTypes.SMALLINT), allowNull: false, defaultValue: [1, 2, 3, 4, 5] },
    laborRateCents: { type: DataTypes.INTEGER, allowNull: false },
    taxRateBasisPoints: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    phone: DataTypes.TEXT,
    email: DataTypes.TEXT,
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, modelName: 'Shop', tableName: 'shops', underscored: true },
);

export class Skill extends Model<InferAttributes<Skill>, InferCreationAttributes<Skill>> {
  declare id: CreationOptional<string>;
  declare networkId: string;
  /** Stable key used by rules and routing, e.g. low_sax. */
  declare code: string;
  declare name: string;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

Skill.init(
  {
    id: idColumn(),
    networkId: networkIdColumn(),
    code: { type: DataTypes.TEXT, allowNull: false, validate: { is: /^[a-z0-9_]+$/ } },
    name: { type: DataTypes.TEXT, allowNull: false },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, modelName: 'Skill', tableName: 'skills', underscored: true },
);

/** A skill a shop offers and the bench hours per week it can give it (routing's capacity). */
export class ShopSkill extends Model<InferAttributes<ShopSkill>, InferCreationAttributes<ShopSkill>> {
  declare networkId: string;
  declare shopId: string;
  declare skillId: string;
  declare weeklyBenchHours: number;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  declare shop?: NonAttribute<Shop>;
  declare skill?: NonAttribute<Skill>;
}

ShopSkill.init(
  {
    networkId: networkIdColumn(),
    shopId: { type: DataTypes.UUID, allowNull: false, primaryKey: true },
    skillId: { type: DataTypes.UUID, allowNull: false, primaryKey: true },
    weeklyBenchHours: decimalColumn('weeklyBenchHours', 6, 2, false),
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, modelName: 'ShopSkill', tableName: 'shop_skills', underscored: true },
);

/** A day the owner closes one shop (besides its weekdays off and public holidays), on the shop's calendar. */
export class ShopClosingDay extends Model<InferAttributes<ShopClosingDay>, InferCreationAttributes<ShopClosingDay>> {
  declare id: CreationOptional<string>;
  declare networkId: string;
  declare shopId: string;
  /** 'YYYY-MM-DD' */
  declare date: string;
  declare reason: string;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

ShopClosingDay.init(
  {
    id: idColumn(),
    networkId: networkIdColumn(),
    shopId: refColumn(),
    date: { type: DataTypes.DATEONLY, allowNull: false },
    reason: { type: DataTypes.TEXT, allowNull: false },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, modelName: 'ShopClosingDay', tableName: 'shop_closing_days', underscored: true },
);

/** A scheduled courier trip from one shop to another. */
export class RelayRun extends Model<InferAttributes<RelayRun>, InferCreationAttributes<RelayRun>> {
  declare id: CreationOptional<string>;
  declare networkId: string;
  declare fromShopId: string;
  declare toShopId: string;
  declare weekdays: IsoWeekday[];
  /** 'HH:MM:SS', local time at the origin shop. */
  declare departureTime: string;
  declare transitHours: number;
  declare active: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  declare fromShop?: NonAttribute<Shop>;
  declare toShop?: NonAttribute<Shop>;
}

RelayRun.init(
  {
    id: idColumn(),
    networkId: networkIdColumn(),
    fromShopId: refColumn(),
    toShopId: refColumn(),
    weekdays: { type: DataTypes.ARRAY(DataTypes.SMALLINT), allowNull: false },
    departureTime: { type: DataTypes.TIME, allowNull: false },
    transitHours: decimalColumn('transitHours', 5, 2, false),
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, modelName: 'RelayRun', tableName: 'relay_runs', underscored: true },
);

// Associations join on the uuid alone (Sequelize has no composite foreign keys); the database enforces
// the composite keys, and every query starts from a row already filtered by network_id.
const rel = { constraints: false } as const;
Network.hasMany(Shop, { ...rel, as: 'shops', foreignKey: 'networkId', sourceKey: 'id' });
Shop.belongsTo(Network, { ...rel, as: 'network', foreignKey: 'networkId', targetKey: 'id' });
Shop.hasMany(ShopSkill, { ...rel, as: 'shopSkills', foreignKey: 'shopId', sourceKey: 'id' });
ShopSkill.belongsTo(Shop, { ...rel, as: 'shop', foreignKey: 'shopId', targetKey: 'id' });
ShopSkill.belongsTo(Skill, { ...rel, as: 'skill', foreignKey: 'skillId', targetKey: 'id' });
Shop.hasMany(RelayRun, { ...rel, as: 'outgoingRuns', foreignKey: 'fromShopId', sourceKey: 'id' });
RelayRun.belongsTo(Shop, { ...rel, as: 'fromShop', foreignKey: 'fromShopId', targetKey: 'id' });
RelayRun.belongsTo(Shop, { ...rel, as: 'toShop', foreignKey: 'toShopId', targetKey: 'id' });
