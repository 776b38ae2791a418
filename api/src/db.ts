// The Sequelize connection. Models are registered by initModels() in models.ts.
import { Sequelize } from 'sequelize';
import type { Config } from './config';

export function createSequelize(config: Config, options: { logging?: boolean } = {}): Sequelize {
  return new Sequelize(config.RW_DB_NAME, config.RW_DB_USER, config.RW_DB_PASSWORD, {
    dialect: 'mariadb',
    host: config.RW_DB_HOST,
    port: config.RW_DB_PORT,
    logging: options.logging ? console.log : false,
    pool: { max: config.RW_DB_POOL_MAX, min: 0, acquire: 10_000, idle: 10_000 },
    dialectOptions: { connectTimeout: 5000, timezone: 'Z' },
    timezone: '+00:00',
    define: { underscored: true },
  });
}
