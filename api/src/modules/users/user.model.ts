// Accounts, their roles and password-reset tokens (tables from db/migrations/001-accounts.ts),
// as Sequelize 6 TypeScript models. Schema changes go through migrations, never sync().
import {
  DataTypes,
  Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
  type Sequelize,
} from 'sequelize';
import { ROLES, type Role } from '../../contracts/accounts';

export class User extends Model<InferAttributes<User, { omit: 'roleRows' }>, InferCreationAttributes<User, { omit: 'roleRows' }>> {
  declare id: CreationOptional<number>;
  declare email: string;
  declare displayName: string;
  declare callSign: string | null;
  declare passwordHash: string;
  declare sessionGeneration: CreationOptional<number>;
  declare disabled: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  /** Loaded with `include: [{ model: UserRole, as: 'roleRows' }]`. */
  declare roleRows?: NonAttribute<UserRole[]>;

  /** The person's roles in a stable order (ROLES order); empty when roleRows was not loaded. */
  get roles(): NonAttribute<Role[]> {
    const held = new Set((this.roleRows ?? []).map((r) => r.role));
    return ROLES.filter((r) => held.has(r));
  }
}

export class UserRole extends Model<InferAttributes<UserRole>, InferCreationAttributes<UserRole>> {
  declare userId: ForeignKey<User['id']>;
  declare role: Role;
}

export class PasswordReset extends Model<InferAttributes<PasswordReset>, InferCreationAttributes<PasswordReset>> {
  declare id: CreationOptional<number>;
  declare userId: ForeignKey<User['id']>;
  /** SHA-256 (hex) of the token mailed to the person; the token itself is never stored. */
  declare tokenHash: string;
  declare expiresAt: Date;
  declare usedAt: Date | null;
  declare createdAt: CreationOptional<Date>;
}

export function initUserModels(sequelize: Sequelize): void {
  User.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
      displayName: { type: DataTypes.STRING(100), allowNull: false },
      callSign: { type: DataTypes.STRING(12), allowNull: true },
      passwordHash: { type: DataTypes.STRING(255), allowNull: false },
      sessionGeneration: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
      disabled: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      createdAt: DataTypes.DATE(3),
      updatedAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: 'users', modelName: 'User', underscored: true },
  );

  UserRole.init(
    {
      userId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, primaryKey: true },
      role: { type: DataTypes.ENUM(...ROLES), allowNull: false, primaryKey: true },
    },
    { sequelize, tableName: 'user_roles', modelName: 'UserRole', underscored: true, timestamps: false },
  );

  PasswordReset.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      userId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      tokenHash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
      expiresAt: { type: DataTypes.DATE(3), allowNull: false },
      usedAt: { type: DataTypes.DATE(3), allowNull: true },
      createdAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: 'password_resets', modelName: 'PasswordReset', underscored: true, updatedAt: false },
  );
}
