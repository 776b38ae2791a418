// What the app's parts need from outside, passed one way: index.ts (or a test) builds one AppDeps,
// createApp() hands each router `Pick<AppDeps, ...>` of what it uses, and every service is called
// as `service(deps, actor, input)`. A leaf file: it imports types only, and nothing from app.ts.
import type { Sequelize } from 'sequelize';
import type { Config } from './config';
import type { Logger } from './logger';

/** The current time. Services read it instead of `new Date()` so that tests can set and move it. */
export type Clock = () => Date;

export const systemClock: Clock = () => new Date();

export interface AppDeps {
  config: Config;
  sequelize: Sequelize;
  /** The process logger; routers hand services the request's child logger (with its request id). */
  logger: Logger;
  clock: Clock;
}

/** AppDeps where the clock may be left out (it is then the system clock). */
export type AppDepsInit = Omit<AppDeps, 'clock'> & Partial<Pick<AppDeps, 'clock'>>;

export function appDeps(init: AppDepsInit): AppDeps {
  return { ...init, clock: init.clock ?? systemClock };
}

/**
 * The same deps with the request's logger (pino-http's `req.log`, which carries the request id),
 * so what a service logs can be traced to the request that caused it.
 */
export function forRequest<D extends { logger: Logger }>(deps: D, req: { log?: Logger }): D {
  return req.log ? { ...deps, logger: req.log } : deps;
}

/** The actor of a route anyone may call (sign-in, registration, password reset): nobody signed in. */
export type Anonymous = null;
