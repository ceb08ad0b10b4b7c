import { DataTypes, Model, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

/**
 * The last catalogue sequence given per project and year. Numbers come only from here, under a
 * row lock, and the counter only grows: a number once given is never given again.
 */
export class FindSequence extends Model<InferAttributes<FindSequence>, InferCreationAttributes<FindSequence>> {
  declare projectId: number;
  declare year: number;
  declare lastSequence: number;
}

export function initFindSequence(sequelize: Sequelize) {
  FindSequence.init(
    {
      projectId: { type: DataTypes.INTEGER.UNSIGNED, primaryKey: true },
      year: { type: DataTypes.INTEGER.UNSIGNED, primaryKey: true },
      lastSequence: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    },
    { sequelize, tableName: "find_sequences", modelName: "FindSequence", timestamps: false },
  );
}
