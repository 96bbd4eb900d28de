// Public surface of @kinespec/api: the HTTP service and its store.
export { buildApp, type BuildAppOptions, type Services, type AppConfig } from './app.js';
export { startService, type RunningService, type StartOptions } from './server.js';
export { startWorker, type RunningWorker } from './worker.js';
export { loadConfig, envVars, ConfigError, type ServiceConfig, type EnvVar } from './config.js';
export { openDatabase, type Database, type Sql } from './database.js';
export { migrate, pendingMigrations, readMigrations } from './migrate.js';
export { problemTypes, problemUri, ProblemError, type ProblemBody } from './problems.js';
export { hashApiKey, newApiKey } from './auth.js';
export { bootstrap } from './bootstrap.js';
export { RECORDING_TYPES } from './routes/recordings.js';
