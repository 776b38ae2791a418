// Accounts, their roles, single-use password-reset tokens, and the sign-in throttle counters
// (kept in the database, not in process memory, so a second API replica sees the same counts).
import { DataTypes, type QueryInterface } from 'sequelize';

export async function up(qi: QueryInterface): Promise<void> {
  await qi.createTable('users', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
    display_name: { type: DataTypes.STRING(100), allowNull: false },
    call_sign: { type: DataTypes.STRING(12), allowNull: true },
    password_hash: { type: DataTypes.STRING(255), allowNull: false },
    // Bumped on sign-out, password change, role change and disabling: older tokens stop working.
    session_generation: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
    disabled: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    created_at: { type: DataTypes.DATE(3), allowNull: false },
    updated_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await qi.createTable('user_roles', {
    user_id: {
      type: DataTypes.INTEGER.UNSIGNED,
      allowNull: false,
      primaryKey: true,
      references: { model: 'users', key: 'id' },
      onDelete: 'CASCADE',
    },
    role: { type: DataTypes.ENUM('member', 'technician', 'treasurer', 'admin'), allowNull: false, primaryKey: true },
  });
  await qi.createTable('password_resets', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    user_id: {
      type: DataTypes.INTEGER.UNSIGNED,
      allowNull: false,
      references: { model: 'users', key: 'id' },
      onDelete: 'CASCADE',
    },
    // SHA-256 of the token mailed to the person; the token itself is never stored.
    token_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
    expires_at: { type: DataTypes.DATE(3), allowNull: false },
    used_at: { type: DataTypes.DATE(3), allowNull: true },
    created_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await qi.createTable('rate_limits', {
    // Limiter name and SHA-256 of its key (address, or account and address): no e-mail stored here.
    rl_key: { type: DataTypes.STRING(100), allowNull: false, primaryKey: true },
    hits: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
    reset_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await qi.addIndex('rate_limits', ['reset_at']);
}

export async function down(qi: QueryInterface): Promise<void> {
  await qi.dropTable('rate_limits');
  await qi.dropTable('password_resets');
  await qi.dropTable('user_roles');
  await qi.dropTable('users');
}
