import { DataTypes, type QueryInterface } from "sequelize";
import type { MigrationParams } from "umzug";

const userFk = { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: "users", key: "id" }, onDelete: "CASCADE" };

/**
 * Sign-in that holds the attacker, not the users: what each attempt was (address, browser, signed
 * device, password or code step), session stages and activity for idle and absolute expiry,
 * two-factor keys and recovery codes, one mail per account lock, and per-user rate buckets.
 */
export async function up({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.addColumn("sign_in_attempts", "user_agent", { type: DataTypes.STRING(255), allowNull: true });
  // The nonce of a valid device cookie for the account, or NULL for a browser that has none.
  await qi.addColumn("sign_in_attempts", "device", { type: DataTypes.CHAR(22), allowNull: true });
  await qi.addColumn("sign_in_attempts", "step", { type: DataTypes.ENUM("password", "code"), allowNull: false, defaultValue: "password" });
  await qi.addIndex("sign_in_attempts", ["device", "created_at"], { name: "sign_in_attempts_device_created_at" });

  // "signed-in" opens the app; the two others only the page of their step.
  await qi.addColumn("sessions", "stage", {
    type: DataTypes.ENUM("signed-in", "second-factor", "two-factor-setup"),
    allowNull: false,
    defaultValue: "signed-in",
  });
  await qi.addColumn("sessions", "shared_bench", { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false });
  await qi.addColumn("sessions", "last_seen_at", { type: DataTypes.DATE(3), allowNull: true });
  await qi.addColumn("sessions", "code_failures", { type: DataTypes.TINYINT.UNSIGNED, allowNull: false, defaultValue: 0 });
  await qi.sequelize.query("UPDATE sessions SET last_seen_at = created_at WHERE last_seen_at IS NULL");

  await qi.createTable("two_factor_keys", {
    user_id: { ...userFk, primaryKey: true },
    // The RFC 6238 shared secret (20 random bytes), base32 as authenticator apps take it.
    secret: { type: DataTypes.STRING(64), allowNull: false },
    // NULL while being set up: the key works only once a code from it has been entered.
    enabled_at: { type: DataTypes.DATE(3), allowNull: true },
    // The last time step whose code was accepted; a code of that step or an earlier one is a replay.
    last_step: { type: DataTypes.BIGINT, allowNull: true },
    created_at: { type: DataTypes.DATE(3), allowNull: false, defaultValue: DataTypes.NOW },
  });

  await qi.createTable("recovery_codes", {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    user_id: userFk,
    code_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
    used_at: { type: DataTypes.DATE(3), allowNull: true },
    created_at: { type: DataTypes.DATE(3), allowNull: false, defaultValue: DataTypes.NOW },
  });
  await qi.addIndex("recovery_codes", ["user_id"]);

  // One row per account that was ever locked; notified_until says which lock has had its mail.
  await qi.createTable("sign_in_locks", {
    email: { type: DataTypes.STRING(254), primaryKey: true },
    locked_until: { type: DataTypes.DATE(3), allowNull: false },
    notified_until: { type: DataTypes.DATE(3), allowNull: true },
  });

  await qi.createTable("rate_limit_buckets", {
    user_id: { type: DataTypes.INTEGER.UNSIGNED, primaryKey: true },
    bucket: { type: DataTypes.STRING(40), primaryKey: true },
    tokens: { type: DataTypes.DOUBLE, allowNull: false },
    updated_at: { type: DataTypes.DATE(3), allowNull: false },
  });
}

export async function down({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.dropTable("rate_limit_buckets");
  await qi.dropTable("sign_in_locks");
  await qi.dropTable("recovery_codes");
  await qi.dropTable("two_factor_keys");
  // Plain ALTERs: removeColumn reads the foreign keys with an untyped raw SELECT, which the mariadb
  // dialect cannot hand back with this driver.
  await qi.sequelize.query(
    "ALTER TABLE sessions DROP COLUMN code_failures, DROP COLUMN last_seen_at, DROP COLUMN shared_bench, DROP COLUMN stage",
  );
  await qi.sequelize.query(
    "ALTER TABLE sign_in_attempts DROP INDEX sign_in_attempts_device_created_at, DROP COLUMN step, DROP COLUMN device, DROP COLUMN user_agent",
  );
}
