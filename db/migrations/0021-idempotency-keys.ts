import { DataTypes } from "sequelize";
import type { Migration } from "../umzug";

// Idempotency keys: the answer a field write gave, kept under the key its client sent, so a resend
// (a phone that lost the first answer) gets that answer again instead of a second record. One key
// per user; the row is written in the same transaction as the record it answered.

const reference = (table: string) => ({
  type: DataTypes.INTEGER.UNSIGNED,
  allowNull: false,
  references: { model: table, key: "id" },
  onDelete: "CASCADE" as const,
  onUpdate: "CASCADE" as const,
});

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.createTable("idempotency_keys", {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false },
    userId: reference("users"),
    // No foreign key to projects: its check takes a shared lock on the project row, and a write that
    // then locks that row (a find's catalogue number) would deadlock with a second send of its key
    // waiting on this row. Keys of a deleted project go with the 30-day purge.
    projectId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    idemKey: { type: DataTypes.STRING(100), allowNull: false },
    /** "POST /api/projects/3/finds/12/custody": the method and path the key was first sent to. */
    scope: { type: DataTypes.STRING(300), allowNull: false },
    /** SHA-256 (hex) of the request's content as the route read it. */
    fingerprint: { type: DataTypes.CHAR(64), allowNull: false },
    recordId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    /** Set once the answer is known (right after the record's transaction commits). */
    statusCode: { type: DataTypes.SMALLINT.UNSIGNED, allowNull: true },
    responseBody: { type: DataTypes.TEXT("medium"), allowNull: true },
    location: { type: DataTypes.STRING(300), allowNull: true },
    createdAt: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.addIndex("idempotency_keys", ["userId", "idemKey"], { name: "idempotency_keys_user_key_unique", unique: true });
  await queryInterface.addIndex("idempotency_keys", ["createdAt"], { name: "idempotency_keys_created" });
};

export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.dropTable("idempotency_keys");
};
