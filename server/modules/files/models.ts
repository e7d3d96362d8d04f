import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
} from 'sequelize';
import { sequelize } from '../../lib/db.js';
import { bigintColumn, idColumn, networkIdColumn, oneOf, optionalRefColumn, refColumn } from '../../lib/columns.js';

export const ATTACHMENT_KINDS = ['photo', 'document'] as const;
export type AttachmentKind = (typeof ATTACHMENT_KINDS)[number];
export const PHOTO_TAGS = ['before', 'after', 'detail'] as const;
export type PhotoTag = (typeof PHOTO_TAGS)[number];
export const ATTACHMENT_STATUSES = ['pending', 'stored', 'failed'] as const;
export type AttachmentStatus = (typeof ATTACHMENT_STATUSES)[number];

/**
 * A photo or document in object storage. The row is written `pending` before the browser uploads
 * (to an upload key, see service.ts), and becomes `stored` only after the server has checked the
 * object (size, type, pixels) and written it to `objectKey`, which no upload link reaches.
 */
export class Attachment extends Model<InferAttributes<Attachment>, InferCreationAttributes<Attachment>> {
  declare id: CreationOptional<string>;
  declare networkId: string;
  declare jobId: CreationOptional<string | null>;
  declare instrumentId: string;
  /** The shop where it was recorded. */
  declare shopId: string;
  declare kind: AttachmentKind;
  /** Photos only. */
  declare tag: CreationOptional<PhotoTag | null>;
  declare caption: CreationOptional<string | null>;
  declare objectKey: string;
  declare thumbnailKey: CreationOptional<string | null>;
  declare contentType: string;
  /** Announced by the browser while pending; the stored object's size once confirmed. */
  declare sizeBytes: number;
  /** The stored object's ETag, recorded at confirm (null for rows stored before it was kept). */
  declare etag: CreationOptional<string | null>;
  declare status: CreationOptional<AttachmentStatus>;
  declare uploadedByUserId: string;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

Attachment.init(
  {
    id: idColumn(),
    networkId: networkIdColumn(),
    jobId: optionalRefColumn(),
    instrumentId: refColumn(),
    shopId: refColumn(),
    kind: { type: DataTypes.TEXT, allowNull: false, validate: oneOf(ATTACHMENT_KINDS) },
    tag: { type: DataTypes.TEXT, validate: oneOf(PHOTO_TAGS) },
    caption: DataTypes.TEXT,
    objectKey: { type: DataTypes.TEXT, allowNull: false },
    thumbnailKey: DataTypes.TEXT,
    contentType: { type: DataTypes.TEXT, allowNull: false },
    sizeBytes: bigintColumn('sizeBytes'),
    etag: DataTypes.TEXT,
    status: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'pending', validate: oneOf(ATTACHMENT_STATUSES) },
    uploadedByUserId: refColumn(),
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, modelName: 'Attachment', tableName: 'attachments', underscored: true },
);
