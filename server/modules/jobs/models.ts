import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
} from 'sequelize';
import {
  ALL_JOB_STAGES,
  INSTRUMENT_FAMILIES,
  JOB_STAGES,
  type InstrumentFamily,
  type JobStage,
} from '../../../shared/domain.js';
import { sequelize } from '../../lib/db.js';
import type { Hazard } from '../../../shared/safety/hazards.js';
import { decimalColumn, hazardsColumn, idColumn, networkIdColumn, oneOf, optionalRefColumn, refColumn } from '../../lib/columns.js';

export const ESTIMATE_APPROVAL_METHODS = ['link', 'in_person', 'phone', 'email'] as const;
export type EstimateApprovalMethod = (typeof ESTIMATE_APPROVAL_METHODS)[number];
export const LINE_ITEM_KINDS = ['labor', 'part'] as const;
export type LineItemKind = (typeof LINE_ITEM_KINDS)[number];
/** A main stage a job on hold goes back to. */
export type MainJobStage = (typeof JOB_STAGES)[number];

/** A piece of work the network offers, with the hours it usually takes. */
export class ServiceCatalogItem extends Model<InferAttributes<ServiceCatalogItem>, InferCreationAttributes<ServiceCatalogItem>> {
  declare id: CreationOptional<string>;
  declare networkId: string;
  declare name: string;
  /** null: offered for every family. */
  declare family: CreationOptional<InstrumentFamily | null>;
  declare standardHours: number;
  declare skillId: CreationOptional<string | null>;
  declare active: CreationOptional<boolean>;
  /** Set by the owner: the hazards of this work, which decide the cautions shown at the bench. */
  declare hazards: CreationOptional<Hazard[]>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

ServiceCatalogItem.init(
  {
    id: idColumn(),
    networkId: networkIdColumn(),
    name: { type: DataTypes.TEXT, allowNull: false },
    family: { type: DataTypes.TEXT, validate: oneOf(INSTRUMENT_FAMILIES) },
    standardHours: decimalColumn('standardHours', 6, 2, false),
    skillId: optionalRefColumn(),
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    hazards: hazardsColumn(),
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, modelName: 'ServiceCatalogItem', tableName: 'service_catalog', underscored: true },
);

/** One visit of one instrument to the network. */
export class Job extends Model<InferAttributes<Job>, InferCreationAttributes<Job>> {
  declare id: CreationOptional<string>;
  declare networkId: string;
  /** Human job number, unique per network. */
  declare number: number;
  declare instrumentId: string;
  declare shopId: string;
  /** Where the customer collects it: the shop that took it in (a transfer does not change it). */
  declare pickupShopId: CreationOptional<string | null>;
  declare customerId: CreationOptional<string | null>;
  declare stage: CreationOptional<JobStage>;
  /** Set exactly while the job is on a hold (waiting_for_parts, in_transit): the stage to resume. */
  declare stageBeforeHold: CreationOptional<MainJobStage | null>;
  declare complaint: CreationOptional<string>;
  declare conditionNotes: CreationOptional<string | null>;
  /** Ticked at the counter (INTAKE_ACCESSORIES); anything else in `accessoriesOther`. */
  declare accessories: CreationOptional<string[]>;
  declare accessoriesOther: CreationOptional<string | null>;
  /** 'YYYY-MM-DD', a calendar date in the shop's time zone. */
  declare promisedOn: CreationOptional<string | null>;
  declare assignedUserId: CreationOptional<string | null>;
  declare requiredSkillId: CreationOptional<string | null>;
  declare estimatedHours: CreationOptional<number | null>;
  declare estimateApprovedAt: CreationOptional<Date | null>;
  declare estimateApprovedByName: CreationOptional<string | null>;
  declare estimateApprovalMethod: CreationOptional<EstimateApprovalMethod | null>;
  /** Moves on with every change of the estimate's lines, tax or total. */
  declare estimateVersion: CreationOptional<number>;
  /** The total and version the customer approved; a later total above it needs a new approval. */
  declare approvedTotalCents: CreationOptional<number | null>;
  declare approvedEstimateVersion: CreationOptional<number | null>;
  declare openedByUserId: string;
  declare openedAt: CreationOptional<Date>;
  declare readyAt: CreationOptional<Date | null>;
  declare releasedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  declare lineItems?: NonAttribute<JobLineItem[]>;
  declare timeLogs?: NonAttribute<TimeLog[]>;
}

Job.init(
  {
    id: idColumn(),
    networkId: networkIdColumn(),
    number: { type: DataTypes.INTEGER, allowNull: false },
    instrumentId: refColumn(),
    shopId: refColumn(),
    pickupShopId: optionalRefColumn(),
    customerId: optionalRefColumn(),
    stage: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'intake', validate: oneOf(ALL_JOB_STAGES) },
    stageBeforeHold: { type: DataTypes.TEXT, validate: oneOf(JOB_STAGES) },
    complaint: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    conditionNotes: DataTypes.TEXT,
    accessories: { type: DataTypes.ARRAY(DataTypes.TEXT), allowNull: false, defaultValue: [] },
    accessoriesOther: DataTypes.TEXT,
    promisedOn: DataTypes.DATEONLY,
    assignedUserId: optionalRefColumn(),
    requiredSkillId: optionalRefColumn(),
    estimatedHours: decimalColumn('estimatedHours', 6, 2),
    estimateApprovedAt: DataTypes.DATE,
    estimateApprovedByName: DataTypes.TEXT,
    estimateApprovalMethod: { type: DataTypes.TEXT, validate: oneOf(ESTIMATE_APPROVAL_METHODS) },
    estimateVersion: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    approvedTotalCents: DataTypes.INTEGER,
    approvedEstimateVersion: DataTypes.INTEGER,
    openedByUserId: refColumn(),
    openedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
    readyAt: DataTypes.DATE,
    releasedAt: DataTypes.DATE,
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, modelName: 'Job', tableName: 'jobs', underscored: true },
);

/** Labor (hours × rate) or a part (quantity × unit price) on a job. Money in cents. */
export class JobLineItem extends Model<InferAttributes<JobLineItem>, InferCreationAttributes<JobLineItem>> {
  declare id: CreationOptional<string>;
  declare networkId: string;
  declare jobId: string;
  declare kind: LineItemKind;
  declare catalogItemId: CreationOptional<string | null>;
  declare partId: CreationOptional<string | null>;
  declare description: string;
  declare hours: CreationOptional<number | null>;
  declare rateCents: CreationOptional<number | null>;
  declare quantity: CreationOptional<number | null>;
  declare unitPriceCents: CreationOptional<number | null>;
  declare position: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  declare job?: NonAttribute<Job>;
  declare catalogItem?: NonAttribute<ServiceCatalogItem>;
}

JobLineItem.init(
  {
    id: idColumn(),
    networkId: networkIdColumn(),
    jobId: refColumn(),
    kind: { type: DataTypes.TEXT, allowNull: false, validate: oneOf(LINE_ITEM_KINDS) },
    catalogItemId: optionalRefColumn(),
    partId: optionalRefColumn(),
    description: { type: DataTypes.TEXT, allowNull: false },
    hours: decimalColumn('hours', 6, 2),
    rateCents: DataTypes.INTEGER,
    quantity: decimalColumn('quantity', 8, 2),
    unitPriceCents: DataTypes.INTEGER,
    position: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, modelName: 'JobLineItem', tableName: 'job_line_items', underscored: true },
);

export class TimeLog extends Model<InferAttributes<TimeLog>, InferCreationAttributes<TimeLog>> {
  declare id: CreationOptional<string>;
  declare networkId: string;
  declare jobId: string;
  declare userId: string;
  declare minutes: number;
  /** 'YYYY-MM-DD' in the shop's time zone. */
  declare workedOn: string;
  declare note: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  declare job?: NonAttribute<Job>;
}

TimeLog.init(
  {
    id: idColumn(),
    networkId: networkIdColumn(),
    jobId: refColumn(),
    userId: refColumn(),
    minutes: { type: DataTypes.INTEGER, allowNull: false, validate: { min: 1 } },
    workedOn: { type: DataTypes.DATEONLY, allowNull: false },
    note: DataTypes.TEXT,
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, modelName: 'TimeLog', tableName: 'time_logs', underscored: true },
);

export const ESTIMATE_DECISIONS = ['approved', 'declined'] as const;
export type EstimateDecisionKind = (typeof ESTIMATE_DECISIONS)[number];

/** One approval or decline of an estimate: who (as typed or told), how, which version, which amount. */
export class EstimateDecision extends Model<InferAttributes<EstimateDecision>, InferCreationAttributes<EstimateDecision>> {
  declare id: CreationOptional<string>;
  declare networkId: string;
  declare jobId: string;
  declare decision: EstimateDecisionKind;
  declare method: EstimateApprovalMethod;
  declare name: string;
  declare totalCents: number;
  declare estimateVersion: number;
  declare decidedAt: Date;
  /** null when the customer decided from the link */
  declare recordedByUserId: CreationOptional<string | null>;
  declare linkId: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;
}

EstimateDecision.init(
  {
    id: idColumn(),
    networkId: networkIdColumn(),
    jobId: refColumn(),
    decision: { type: DataTypes.TEXT, allowNull: false, validate: oneOf(ESTIMATE_DECISIONS) },
    method: { type: DataTypes.TEXT, allowNull: false, validate: oneOf(ESTIMATE_APPROVAL_METHODS) },
    name: { type: DataTypes.TEXT, allowNull: false },
    totalCents: { type: DataTypes.INTEGER, allowNull: false },
    estimateVersion: { type: DataTypes.INTEGER, allowNull: false },
    decidedAt: { type: DataTypes.DATE, allowNull: false },
    recordedByUserId: optionalRefColumn(),
    linkId: optionalRefColumn(),
    createdAt: DataTypes.DATE,
  },
  { sequelize, modelName: 'EstimateDecision', tableName: 'estimate_decisions', underscored: true, updatedAt: false },
);

/** A private link to a job's public page. Only the token's SHA-256 is stored. */
export class CustomerLink extends Model<InferAttributes<CustomerLink>, InferCreationAttributes<CustomerLink>> {
  declare id: CreationOptional<string>;
  declare networkId: string;
  declare jobId: string;
  declare tokenHash: Buffer;
  declare createdByUserId: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;
  declare revokedAt: CreationOptional<Date | null>;
  declare revokedByUserId: CreationOptional<string | null>;
  declare lastOpenedAt: CreationOptional<Date | null>;
}

CustomerLink.init(
  {
    id: idColumn(),
    networkId: networkIdColumn(),
    jobId: refColumn(),
    tokenHash: { type: DataTypes.BLOB, allowNull: false },
    createdByUserId: optionalRefColumn(),
    createdAt: DataTypes.DATE,
    revokedAt: DataTypes.DATE,
    revokedByUserId: optionalRefColumn(),
    lastOpenedAt: DataTypes.DATE,
  },
  { sequelize, modelName: 'CustomerLink', tableName: 'customer_links', underscored: true, updatedAt: false },
);

const rel = { constraints: false } as const;
Job.hasMany(JobLineItem, { ...rel, as: 'lineItems', foreignKey: 'jobId', sourceKey: 'id' });
JobLineItem.belongsTo(Job, { ...rel, as: 'job', foreignKey: 'jobId', targetKey: 'id' });
JobLineItem.belongsTo(ServiceCatalogItem, { ...rel, as: 'catalogItem', foreignKey: 'catalogItemId', targetKey: 'id' });
Job.hasMany(TimeLog, { ...rel, as: 'timeLogs', foreignKey: 'jobId', sourceKey: 'id' });
TimeLog.belongsTo(Job, { ...rel, as: 'job', foreignKey: 'jobId', targetKey: 'id' });
