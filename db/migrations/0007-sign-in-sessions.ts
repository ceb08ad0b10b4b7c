import { DataTypes } from "sequelize";
import type { Migration } from "../umzug";

// Sign-in sessions kept on the server: the cookie carries a random token whose SHA-256 is stored
// here, so signing out, a password change or reset, or a disabled account can end a session for
// good (a signed cookie alone stays valid until it expires).

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.createTable("sign_in_sessions", {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false },
    userId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: "users", key: "id" }, onDelete: "CASCADE", onUpdate: "CASCADE" },
    tokenHash: { type: DataTypes.CHAR(64), allowNull: false },
    /** What signed in (the browser's User-Agent, cut to 300 characters) and from where. */
    userAgent: { type: DataTypes.STRING(300), allowNull: false },
    ip: { type: DataTypes.STRING(64), allowNull: true },
    lastSeenAt: { type: DataTypes.DATE, allowNull: false },
    /** The absolute end of the session, whatever its use. */
    expiresAt: { type: DataTypes.DATE, allowNull: false },
    /** Set when the session was ended (signed out, password changed or reset, account disabled). */
    endedAt: { type: DataTypes.DATE, allowNull: true },
    endedReason: { type: DataTypes.STRING(40), allowNull: true },
    createdAt: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.addIndex("sign_in_sessions", ["tokenHash"], { name: "sign_in_sessions_token_hash_unique", unique: true });
  await queryInterface.addIndex("sign_in_sessions", ["userId", "endedAt"], { name: "sign_in_sessions_user_open" });
};

export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.dropTable("sign_in_sessions");
};
