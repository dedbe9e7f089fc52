import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { MailKind } from '../../../shared/domain/notifications.js';

/** One attachment as the outbox keeps it until sent. */
export interface OutboxAttachment {
  filename: string;
  contentType: string;
  /** base64 */
  content: string;
}

/** A queued notification (table `outbox`); the worker in outbox.worker.ts sends it. */
export class OutboxModel extends Model<InferAttributes<OutboxModel>, InferCreationAttributes<OutboxModel>> {
  declare id: CreationOptional<number>;
  declare kind: MailKind;
  declare recipientId: number | null;
  declare toAddress: string;
  declare subject: string;
  declare textBody: string;
  declare htmlBody: string;
  declare attachments: CreationOptional<OutboxAttachment[]>;
  declare status: CreationOptional<'pending' | 'sent' | 'failed'>;
  declare attempts: CreationOptional<number>;
  declare nextAttemptAt: CreationOptional<Date>;
  declare lastError: CreationOptional<string | null>;
  declare messageId: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;
  declare sentAt: CreationOptional<Date | null>;

  static initModel(sequelize: Sequelize): void {
    OutboxModel.init(
      {
        id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true, get() { return Number(this.getDataValue('id')); } },
        kind: { type: DataTypes.TEXT, allowNull: false },
        recipientId: { type: DataTypes.INTEGER, allowNull: true },
        toAddress: { type: DataTypes.TEXT, allowNull: false },
        subject: { type: DataTypes.TEXT, allowNull: false },
        textBody: { type: DataTypes.TEXT, allowNull: false },
        htmlBody: { type: DataTypes.TEXT, allowNull: false },
        attachments: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
        status: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'pending' },
        attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        nextAttemptAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
        lastError: { type: DataTypes.TEXT, allowNull: true },
        messageId: { type: DataTypes.TEXT, allowNull: true },
        createdAt: DataTypes.DATE,
        sentAt: { type: DataTypes.DATE, allowNull: true },
      },
      { sequelize, tableName: 'outbox', underscored: true, updatedAt: false },
    );
  }
}
