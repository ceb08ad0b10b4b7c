import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import { z } from "zod";
import { jsonColumn } from "./json-column";

export const OUTGOING_MAIL_STATUSES = ["pending", "sent", "failed"] as const;
export type OutgoingMailStatus = (typeof OUTGOING_MAIL_STATUSES)[number];

/** A file a mail carries, named by its object-storage key: the bytes stay in storage until sending. */
export const mailAttachmentSchema = z.object({ storageKey: z.string().min(1).max(300), filename: z.string().min(1).max(200), contentType: z.string().min(1).max(100) });
export type MailAttachment = z.infer<typeof mailAttachmentSchema>;

/** A mail waiting in the outbox, sent, or given up on (app/lib/mail/outbox.server.ts). */
export class OutgoingMail extends Model<InferAttributes<OutgoingMail>, InferCreationAttributes<OutgoingMail>> {
  declare id: CreationOptional<number>;
  declare toAddress: string;
  declare subject: string;
  declare bodyText: string;
  declare ref: string | null;
  declare attachments: CreationOptional<MailAttachment[] | null>;
  declare status: CreationOptional<OutgoingMailStatus>;
  declare attempts: CreationOptional<number>;
  declare lastError: CreationOptional<string | null>;
  declare nextAttemptAt: Date;
  declare sentAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
}

export function initOutgoingMail(sequelize: Sequelize) {
  OutgoingMail.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      toAddress: { type: DataTypes.STRING(254), allowNull: false },
      subject: { type: DataTypes.STRING(300), allowNull: false },
      bodyText: { type: DataTypes.TEXT("medium"), allowNull: false },
      ref: { type: DataTypes.STRING(80), allowNull: true },
      attachments: jsonColumn("outgoing_mails", "attachments", z.array(mailAttachmentSchema).max(10), { allowNull: true }),
      status: { type: DataTypes.STRING(12), allowNull: false, defaultValue: "pending", validate: { isIn: [OUTGOING_MAIL_STATUSES] } },
      attempts: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
      lastError: { type: DataTypes.STRING(500), allowNull: true },
      nextAttemptAt: { type: DataTypes.DATE, allowNull: false },
      sentAt: { type: DataTypes.DATE, allowNull: true },
      createdAt: DataTypes.DATE,
    },
    {
      sequelize, tableName: "outgoing_mails", modelName: "OutgoingMail", updatedAt: false,
      indexes: [
        { name: "outgoing_mails_due", fields: ["status", "nextAttemptAt"] },
        { name: "outgoing_mails_ref", fields: ["ref"] },
      ],
    },
  );
}
