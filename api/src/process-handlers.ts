// Process-level safety nets: an unhandled promise rejection or an uncaught exception is logged as
// JSON (pino) instead of vanishing or printing a bare stack. A rejection nobody handled is a bug
// but leaves the process sound, so the API keeps serving; after an uncaught exception the process
// state is unknown, so it stops (onFatal) and the supervisor restarts it.
import type { Logger } from './logger';

export function installProcessHandlers(logger: Logger, onFatal: (err: unknown) => void, proc: NodeJS.EventEmitter = process): void {
  proc.on('unhandledRejection', (reason: unknown) => {
    logger.error({ err: reason }, 'unhandled promise rejection');
  });
  proc.on('uncaughtException', (err: unknown, origin: unknown) => {
    logger.fatal({ err, origin }, 'uncaught exception; stopping');
    onFatal(err);
  });
}
