// Entry point: configuration, database, HTTP server and the outbox worker; graceful shutdown.
import { loadConfig, type Config } from './config';
import { createLogger } from './logger';
import { createSequelize } from './db';
import { initModels } from './models';
import { createApp } from './app';
import { systemClock, type AppDeps } from './deps';
import { backgroundWork } from './background';
import { createHttpServer } from './http-server';
import { installProcessHandlers } from './process-handlers';
import { startOutboxWorker } from './modules/outbox/outbox.worker';

let config: Config;
try {
  config = loadConfig();
} catch (err) {
  // Says which variable to set; a stack trace would only hide that.
  console.error((err as Error).message);
  process.exit(1);
}
const logger = createLogger(config.RW_LOG_LEVEL);
const sequelize = createSequelize(config);
initModels(sequelize);

const deps: AppDeps = { config, sequelize, logger, clock: systemClock };
const app = createApp(deps);
const server = createHttpServer(app, config);
server.listen(config.RW_PORT, config.RW_HOST, () => {
  logger.info({ url: `http://${config.RW_HOST}:${config.RW_PORT}` }, 'Rigwright API listening');
});
server.on('error', (err) => {
  logger.fatal({ err }, 'cannot listen');
  process.exit(1);
});
const worker = config.RW_OUTBOX_INTERVAL_MS > 0 ? startOutboxWorker(deps) : undefined;

let stopping = false;
async function shutdown(reason: string, code = 0) {
  if (stopping) return;
  stopping = true;
  logger.info({ reason }, 'shutting down');
  // Never hang on the way out: whatever is still pending after 10 s is abandoned.
  setTimeout(() => process.exit(code || 1), 10_000).unref();
  server.close();
  server.closeIdleConnections();
  await Promise.allSettled([worker?.stop(), backgroundWork.idle()]);
  server.closeAllConnections();
  await sequelize.close().catch(() => {});
  process.exit(code);
}
installProcessHandlers(logger, () => void shutdown('uncaughtException', 1));
process.on('SIGINT', () => void shutdown('SIGINT'));
process.on('SIGTERM', () => void shutdown('SIGTERM'));
