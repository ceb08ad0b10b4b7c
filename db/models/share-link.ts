import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import type { Project } from "./project";
import type { User } from "./user";

/** A public, read-only progress link for a project. Only the token's SHA-256 is stored. */
export class ShareLink extends Model<InferAttributes<ShareLink>, InferCreationAttributes<ShareLink>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  declare name: string;
  declare tokenHash: string;
  /** Short text outreach writes for the public page (plain text, shown as is). */
  declare publicText: string;
  declare createdById: ForeignKey<User["id"]> | null;
  declare revokedAt: Date | null;
  declare revokedById: ForeignKey<User["id"]> | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initShareLink(sequelize: Sequelize) {
  ShareLink.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      name: { type: DataTypes.STRING(120), allowNull: false },
      tokenHash: { type: DataTypes.CHAR(64), allowNull: false },
      publicText: { type: DataTypes.TEXT, allowNull: false },
      revokedAt: { type: DataTypes.DATE, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    {
      sequelize, tableName: "share_links", modelName: "ShareLink",
      indexes: [
        { name: "share_links_token_hash_unique", unique: true, fields: ["tokenHash"] },
        { name: "share_links_project_created", fields: ["projectId", "createdAt"] },
      ],
    },
  );
}
