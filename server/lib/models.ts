import type { NonAttribute } from 'sequelize';
import { Network, RelayRun, Shop, ShopClosingDay, ShopSkill, Skill } from '../modules/networks/models.js';
import { AuditLog, Invitation, Membership, TechnicianSkill, User } from '../modules/members/models.js';
import { Customer, HistoryEvent, Instrument } from '../modules/registry/models.js';
import { CustomerLink, EstimateDecision, Job, JobLineItem, ServiceCatalogItem, TimeLog } from '../modules/jobs/models.js';
import { Attachment } from '../modules/files/models.js';
import { Transfer } from '../modules/transfers/models.js';
import { PadMap } from '../modules/padmaps/models.js';
import { Part, StockLevel, StockReservation } from '../modules/stock/models.js';
import { Notification, NotificationPreference, OutboxMessage } from '../modules/notifications/models.js';
import { sequelize } from './db.js';

/**
 * Every model, registered once, with the associations that cross module boundaries (each module's
 * models.ts wires its own). Import models from here so these associations always exist.
 *
 * Associations are for reading (`include`). Sequelize has no composite foreign keys, so they join on
 * the uuid alone with `constraints: false`; the database enforces the composite (network_id, id) keys,
 * and every query starts from rows already filtered by the session's network.
 */
export {
  Network, Shop, Skill, ShopSkill, ShopClosingDay, RelayRun,
  User, Membership, TechnicianSkill, Invitation, AuditLog,
  Customer, Instrument, HistoryEvent,
  Job, JobLineItem, TimeLog, ServiceCatalogItem, EstimateDecision, CustomerLink,
  Attachment, Transfer, PadMap,
  Part, StockLevel, StockReservation,
  Notification, NotificationPreference, OutboxMessage,
  sequelize,
};

const rel = { constraints: false } as const;

// networks ↔ members
Shop.hasMany(Membership, { ...rel, as: 'memberships', foreignKey: 'shopId', sourceKey: 'id' });
Membership.belongsTo(Shop, { ...rel, as: 'shop', foreignKey: 'shopId', targetKey: 'id' });
TechnicianSkill.belongsTo(Shop, { ...rel, as: 'shop', foreignKey: 'shopId', targetKey: 'id' });
TechnicianSkill.belongsTo(Skill, { ...rel, as: 'skill', foreignKey: 'skillId', targetKey: 'id' });

// registry
Customer.belongsTo(Shop, { ...rel, as: 'homeShop', foreignKey: 'homeShopId', targetKey: 'id' });
Instrument.belongsTo(Shop, { ...rel, as: 'currentShop', foreignKey: 'currentShopId', targetKey: 'id' });
Instrument.hasMany(Job, { ...rel, as: 'jobs', foreignKey: 'instrumentId', sourceKey: 'id' });
Instrument.hasMany(Attachment, { ...rel, as: 'attachments', foreignKey: 'instrumentId', sourceKey: 'id' });
Instrument.hasMany(PadMap, { ...rel, as: 'padMaps', foreignKey: 'instrumentId', sourceKey: 'id' });
HistoryEvent.belongsTo(Job, { ...rel, as: 'job', foreignKey: 'jobId', targetKey: 'id' });
HistoryEvent.belongsTo(Shop, { ...rel, as: 'shop', foreignKey: 'shopId', targetKey: 'id' });
HistoryEvent.belongsTo(User, { ...rel, as: 'user', foreignKey: 'userId', targetKey: 'id' });

// jobs
ServiceCatalogItem.belongsTo(Skill, { ...rel, as: 'skill', foreignKey: 'skillId', targetKey: 'id' });
Job.belongsTo(Instrument, { ...rel, as: 'instrument', foreignKey: 'instrumentId', targetKey: 'id' });
Job.belongsTo(Shop, { ...rel, as: 'shop', foreignKey: 'shopId', targetKey: 'id' });
Job.belongsTo(Customer, { ...rel, as: 'customer', foreignKey: 'customerId', targetKey: 'id' });
Job.belongsTo(User, { ...rel, as: 'assignee', foreignKey: 'assignedUserId', targetKey: 'id' });
Job.belongsTo(User, { ...rel, as: 'openedBy', foreignKey: 'openedByUserId', targetKey: 'id' });
Job.belongsTo(Skill, { ...rel, as: 'requiredSkill', foreignKey: 'requiredSkillId', targetKey: 'id' });
Job.hasMany(Transfer, { ...rel, as: 'transfers', foreignKey: 'jobId', sourceKey: 'id' });
Job.hasMany(Attachment, { ...rel, as: 'attachments', foreignKey: 'jobId', sourceKey: 'id' });
Job.hasMany(StockReservation, { ...rel, as: 'reservations', foreignKey: 'jobId', sourceKey: 'id' });
JobLineItem.belongsTo(Part, { ...rel, as: 'part', foreignKey: 'partId', targetKey: 'id' });
TimeLog.belongsTo(User, { ...rel, as: 'user', foreignKey: 'userId', targetKey: 'id' });

// files
Attachment.belongsTo(Job, { ...rel, as: 'job', foreignKey: 'jobId', targetKey: 'id' });
Attachment.belongsTo(Instrument, { ...rel, as: 'instrument', foreignKey: 'instrumentId', targetKey: 'id' });
Attachment.belongsTo(Shop, { ...rel, as: 'shop', foreignKey: 'shopId', targetKey: 'id' });
Attachment.belongsTo(User, { ...rel, as: 'uploadedBy', foreignKey: 'uploadedByUserId', targetKey: 'id' });

// transfers
Transfer.belongsTo(Job, { ...rel, as: 'job', foreignKey: 'jobId', targetKey: 'id' });
Transfer.belongsTo(Instrument, { ...rel, as: 'instrument', foreignKey: 'instrumentId', targetKey: 'id' });
Transfer.belongsTo(Shop, { ...rel, as: 'fromShop', foreignKey: 'fromShopId', targetKey: 'id' });
Transfer.belongsTo(Shop, { ...rel, as: 'toShop', foreignKey: 'toShopId', targetKey: 'id' });
Transfer.belongsTo(User, { ...rel, as: 'requestedBy', foreignKey: 'requestedByUserId', targetKey: 'id' });
Transfer.belongsTo(User, { ...rel, as: 'approvedBy', foreignKey: 'approvedByUserId', targetKey: 'id' });
Transfer.belongsTo(User, { ...rel, as: 'packedBy', foreignKey: 'packedByUserId', targetKey: 'id' });
Transfer.belongsTo(User, { ...rel, as: 'receivedBy', foreignKey: 'receivedByUserId', targetKey: 'id' });
Transfer.belongsTo(RelayRun, { ...rel, as: 'relayRun', foreignKey: 'relayRunId', targetKey: 'id' });

// pad maps
PadMap.belongsTo(Instrument, { ...rel, as: 'instrument', foreignKey: 'instrumentId', targetKey: 'id' });
PadMap.belongsTo(Job, { ...rel, as: 'job', foreignKey: 'jobId', targetKey: 'id' });
PadMap.belongsTo(Shop, { ...rel, as: 'shop', foreignKey: 'shopId', targetKey: 'id' });
PadMap.belongsTo(User, { ...rel, as: 'createdBy', foreignKey: 'createdByUserId', targetKey: 'id' });

// stock
StockLevel.belongsTo(Shop, { ...rel, as: 'shop', foreignKey: 'shopId', targetKey: 'id' });
StockReservation.belongsTo(Job, { ...rel, as: 'job', foreignKey: 'jobId', targetKey: 'id' });
StockReservation.belongsTo(Shop, { ...rel, as: 'shop', foreignKey: 'shopId', targetKey: 'id' });

// notifications
Notification.belongsTo(User, { ...rel, as: 'user', foreignKey: 'userId', targetKey: 'id' });

// Types for the included rows above, merged into the model classes of the other modules.
declare module '../modules/networks/models.js' {
  interface Shop {
    memberships?: NonAttribute<Membership[]>;
  }
}
declare module '../modules/members/models.js' {
  interface Membership {
    shop?: NonAttribute<Shop>;
  }
  interface TechnicianSkill {
    shop?: NonAttribute<Shop>;
    skill?: NonAttribute<Skill>;
  }
}
declare module '../modules/registry/models.js' {
  interface Customer {
    homeShop?: NonAttribute<Shop>;
  }
  interface Instrument {
    currentShop?: NonAttribute<Shop>;
    jobs?: NonAttribute<Job[]>;
    attachments?: NonAttribute<Attachment[]>;
    padMaps?: NonAttribute<PadMap[]>;
  }
  interface HistoryEvent {
    job?: NonAttribute<Job>;
    shop?: NonAttribute<Shop>;
    user?: NonAttribute<User>;
  }
}
declare module '../modules/jobs/models.js' {
  interface ServiceCatalogItem {
    skill?: NonAttribute<Skill>;
  }
  interface Job {
    instrument?: NonAttribute<Instrument>;
    shop?: NonAttribute<Shop>;
    customer?: NonAttribute<Customer>;
    assignee?: NonAttribute<User>;
    openedBy?: NonAttribute<User>;
    requiredSkill?: NonAttribute<Skill>;
    transfers?: NonAttribute<Transfer[]>;
    attachments?: NonAttribute<Attachment[]>;
    reservations?: NonAttribute<StockReservation[]>;
  }
  interface JobLineItem {
    part?: NonAttribute<Part>;
  }
  interface TimeLog {
    user?: NonAttribute<User>;
  }
}
declare module '../modules/files/models.js' {
  interface Attachment {
    job?: NonAttribute<Job>;
    instrument?: NonAttribute<Instrument>;
    shop?: NonAttribute<Shop>;
    uploadedBy?: NonAttribute<User>;
  }
}
declare module '../modules/transfers/models.js' {
  interface Transfer {
    job?: NonAttribute<Job>;
    instrument?: NonAttribute<Instrument>;
    fromShop?: NonAttribute<Shop>;
    toShop?: NonAttribute<Shop>;
    requestedBy?: NonAttribute<User>;
    approvedBy?: NonAttribute<User>;
    packedBy?: NonAttribute<User>;
    receivedBy?: NonAttribute<User>;
    relayRun?: NonAttribute<RelayRun>;
  }
}
declare module '../modules/padmaps/models.js' {
  interface PadMap {
    instrument?: NonAttribute<Instrument>;
    job?: NonAttribute<Job>;
    shop?: NonAttribute<Shop>;
    createdBy?: NonAttribute<User>;
  }
}
declare module '../modules/stock/models.js' {
  interface StockLevel {
    shop?: NonAttribute<Shop>;
  }
  interface StockReservation {
    job?: NonAttribute<Job>;
    shop?: NonAttribute<Shop>;
  }
}
declare module '../modules/notifications/models.js' {
  interface Notification {
    user?: NonAttribute<User>;
  }
}
