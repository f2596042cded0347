/**
 * Production entry point: reads the config, migrates, listens. Needs DATABASE_URL; for a
 * development machine use `npm start`, which also runs a private PostgreSQL and the demo seed.
 */
import { startServer } from './app';
import { loadConfig } from './config';
import { migrate } from './db/migrate';
import { createLogger } from './http/logger';
import { onShutdownSignals } from './lifecycle/on-shutdown';
import { surviveLostConnections } from './lifecycle/survive-lost-connections';
import { startEmbeddedWorker } from './workers/embedded-worker';
import { warmInteractivePool } from './workers/interactive-pool';

async function main(): Promise<void> {
  const { config, warnings } = loadConfig();
  const logger = createLogger(config.logLevel);
  surviveLostConnections(logger);
  for (const w of warnings) logger.warn(w);
  if (!config.databaseUrl) throw new Error('DATABASE_URL is required (or use `npm start` for a private development database)');
  await migrate(config.databaseUrl);
  const server = await startServer({ config, logger });
  warmInteractivePool(server.app.context.interactive, logger);
  const embedded = await startEmbeddedWorker(config, config.databaseUrl, logger);
  onShutdownSignals(logger, [
    ...(embedded ? [{ name: 'embedded sweep worker', run: () => embedded.stop() }] : []),
    { name: 'server', run: () => server.close() },
  ]);
  logger.info({ url: server.url, oauth: config.oauth.mode }, `Quarterturn listening on ${server.url}`);
}

main().catch((err: unknown) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
