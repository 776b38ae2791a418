// Entry point: configuration, database, HTTP server and the outbox worker; graceful shutdown.
import { loadConfig } from './config';
import { createLogger } from './logger';
import { createSequelize } from './db';
import { initModels } from './models';
import { createApp } from './app';
import { systemClock, type AppDeps } from './deps';
import { startOutboxWorker } from './modules/outbox/outbox.worker';

const config = loadConfig();
const logger = createLogger(config.RW_LOG_LEVEL);
const sequelize = createSequelize(config);
initModels(sequelize);

const deps: AppDeps = { config, sequelize, logger, clock: systemClock };
const app = createApp(deps);
const server = app.listen(config.RW_PORT, config.RW_HOST, () => {
  logger.info({ url: `http://${config.RW_HOST}:${config.RW_PORT}` }, 'Rigwright API listening');
});
server.on('error', (err) => {
  logger.fatal({ err }, 'cannot listen');
  process.exit(1);
});
const worker = config.RW_OUTBOX_INTERVAL_MS > 0 ? startOutboxWorker(deps) : undefined;

let stopping = false;
async function shutdown(signal: string) {
  if (stopping) return;
  stopping = true;
  logger.info({ signal }, 'shutting down');
  await worker?.stop();
  server.close();
  server.closeAllConnections();
  await sequelize.close().catch(() => {});
  process.exit(0);
}
process.on('SIGINT', () => void shutdown('SIGINT'));
process.on('SIGTERM', () => void shutdown('SIGTERM'));
