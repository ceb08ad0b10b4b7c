import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from "sequelize";
import type { Find } from "./find";
import type { HoldCell } from "./hold-cell";
import type { HoldNotice } from "./hold-notice";
import type { Project } from "./project";
import type { User } from "./user";

/**
 * A stop-work hold around a cultural find or human remains: the cells within the radius (HoldCell)
 * cannot be assigned until the hold is lifted with the name of whoever authorised resuming.
 */
export class Hold extends Model<InferAttributes<Hold>, InferCreationAttributes<Hold>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  declare findId: ForeignKey<Find["id"]>;
  declare radiusM: number;
  declare radiusSource: string;
  declare placedAt: Date;
  declare liftedAt: Date | null;
  declare liftedById: ForeignKey<User["id"]> | null;
  declare authorisedBy: string | null;
  declare liftNote: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare cells?: NonAttribute<HoldCell[]>;
  declare notices?: NonAttribute<HoldNotice[]>;
  declare find?: NonAttribute<Find>;
  declare liftedBy?: NonAttribute<User>;
}

export function initHold(sequelize: Sequelize) {
  Hold.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      radiusM: { type: DataTypes.DOUBLE, allowNull: false },
      radiusSource: { type: DataTypes.STRING(500), allowNull: false },
      placedAt: { type: DataTypes.DATE, allowNull: false },
      liftedAt: { type: DataTypes.DATE, allowNull: true },
      authorisedBy: { type: DataTypes.STRING(200), allowNull: true },
      liftNote: { type: DataTypes.TEXT, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: "holds", modelName: "Hold", indexes: [{ name: "holds_project_open", fields: ["projectId", "liftedAt"] }] },
  );
}
