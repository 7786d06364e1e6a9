export { createApp, type BuiltApp } from './app';
export { startApiServer, type RunningServer } from './server';
export { loadConfig, type Config } from './config';
export { migrate } from './db/migrate';
export type { AppContext } from './context';
export type { RunSnapshot } from './runs/runs.model';
