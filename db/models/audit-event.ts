import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from "sequelize";
import { jsonColumn, jsonObject } from "./json-column";
import type { Project } from "./project";
import type { User } from "./user";

/** Who did what, when, from where. Written once, never updated. */
export class AuditEvent extends Model<InferAttributes<AuditEvent>, InferCreationAttributes<AuditEvent>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]> | null;
  declare userId: ForeignKey<User["id"]> | null;
  declare action: string;
  declare detail: CreationOptional<Record<string, unknown>>;
  declare ip: string | null;
  declare createdAt: CreationOptional<Date>;
  declare user?: NonAttribute<User | null>;
}

export function initAuditEvent(sequelize: Sequelize) {
  AuditEvent.init(
    {
      id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
      action: { type: DataTypes.STRING(60), allowNull: false },
      detail: jsonColumn("audit_events", "detail", jsonObject, { defaultValue: {} }),
      ip: { type: DataTypes.STRING(64), allowNull: true },
      createdAt: DataTypes.DATE,
    },
    {
      sequelize, tableName: "audit_events", modelName: "AuditEvent", updatedAt: false,
      indexes: [
        { name: "audit_events_project_created", fields: ["projectId", "createdAt"] },
        { name: "audit_events_user_created", fields: ["userId", "createdAt"] },
      ],
    },
  );
}
