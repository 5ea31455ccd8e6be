import {
  DataTypes,
  Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from "sequelize";
import type { Role } from "../../permissions";

export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
  declare id: CreationOptional<number>;
  declare email: string;
  declare name: string;
  declare role: Role;
  /** Set for client contacts: the organisation whose data they may see. */
  declare clientId: number | null;
  declare passwordHash: string | null;
  declare active: CreationOptional<boolean>;
  declare lastSignInAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Session extends Model<InferAttributes<Session>, InferCreationAttributes<Session>> {
  declare id: string;
  declare userId: ForeignKey<number>;
  declare expiresAt: Date;
  declare ip: string | null;
  declare userAgent: string | null;
  declare createdAt: CreationOptional<Date>;
}

export class AuthToken extends Model<InferAttributes<AuthToken>, InferCreationAttributes<AuthToken>> {
  declare id: CreationOptional<number>;
  declare userId: number;
  declare purpose: "invitation" | "reset";
  /** SHA-256 of the token in the link; the token itself is never stored. */
  declare tokenHash: string;
  declare expiresAt: Date;
  declare usedAt: Date | null;
  declare createdBy: number | null;
  declare createdAt: CreationOptional<Date>;
}

export class SignInAttempt extends Model<InferAttributes<SignInAttempt>, InferCreationAttributes<SignInAttempt>> {
  declare id: CreationOptional<number>;
  declare email: string;
  declare ip: string;
  declare succeeded: boolean;
  declare createdAt: CreationOptional<Date>;
}

export function initAuthModels(sequelize: Sequelize) {
  User.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
      name: { type: DataTypes.STRING(120), allowNull: false },
      role: { type: DataTypes.ENUM("technician", "manager", "safety", "client", "admin"), allowNull: false },
      clientId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      passwordHash: { type: DataTypes.STRING(255), allowNull: true },
      active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
      lastSignInAt: { type: DataTypes.DATE(3), allowNull: true },
      createdAt: DataTypes.DATE(3),
      updatedAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: "users", modelName: "User" },
  );
  Session.init(
    {
      id: { type: DataTypes.STRING(64), primaryKey: true },
      expiresAt: { type: DataTypes.DATE(3), allowNull: false },
      ip: { type: DataTypes.STRING(45), allowNull: true },
      userAgent: { type: DataTypes.STRING(255), allowNull: true },
      createdAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: "sessions", modelName: "Session", updatedAt: false },
  );
  AuthToken.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      userId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      purpose: { type: DataTypes.ENUM("invitation", "reset"), allowNull: false },
      tokenHash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
      expiresAt: { type: DataTypes.DATE(3), allowNull: false },
      usedAt: { type: DataTypes.DATE(3), allowNull: true },
      createdBy: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      createdAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: "auth_tokens", modelName: "AuthToken", updatedAt: false },
  );
  SignInAttempt.init(
    {
      id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
      email: { type: DataTypes.STRING(254), allowNull: false },
      ip: { type: DataTypes.STRING(45), allowNull: false },
      succeeded: { type: DataTypes.BOOLEAN, allowNull: false },
      createdAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: "sign_in_attempts", modelName: "SignInAttempt", updatedAt: false },
  );
  User.hasMany(Session, { foreignKey: "userId", onDelete: "CASCADE" });
  Session.belongsTo(User, { foreignKey: "userId" });
}
