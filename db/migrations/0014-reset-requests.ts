import { DataTypes } from "sequelize";
import type { Migration } from "../umzug";

// Every "forgot password" request, whether or not the address has an account, so that requests
// can be limited per client and per typed address the same way on both paths.

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.createTable("reset_requests", {
    id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false },
    /** The address as typed (lower-cased); it may have no account. */
    email: { type: DataTypes.STRING(254), allowNull: false },
    ip: { type: DataTypes.STRING(64), allowNull: false },
    createdAt: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.addIndex("reset_requests", ["email", "createdAt"], { name: "reset_requests_email_created" });
  await queryInterface.addIndex("reset_requests", ["ip", "createdAt"], { name: "reset_requests_ip_created" });
};

export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.dropTable("reset_requests");
};
