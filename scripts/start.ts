/**
 * `npm start`: the whole app on one machine with nothing configured. Uses DATABASE_URL when
 * set, otherwise a private PostgreSQL cluster under .data/postgres on port 54329; migrates,
 * seeds the demo data, rebuilds the web app when stale, runs the fake OAuth provider when no
 * GitHub app is configured, and listens on PUBLIC_URL. Ctrl-C stops everything.
 */
import { resolve } from 'node:path';
import { Client } from 'pg';
import { startServer } from '../api/src/app';
import { ConfigError, loadConfig } from '../api/src/config';
import { migrate } from '../api/src/db/migrate';
import { createSequelize } from '../api/src/db/sequelize';
import { seedDemo } from '../api/src/demo/seed-demo';
import { followDemoTrials } from '../api/src/demo/seed-demo-trials';
import { isDevelopmentMode } from '../api/src/dev/development-mode';
import { startFakeSmtp } from '../api/src/dev/fake-smtp/fake-smtp-server';
import { createLogger } from '../api/src/http/logger';
import { onShutdownSignals, type ShutdownStep } from '../api/src/lifecycle/on-shutdown';
import { surviveLostConnections } from '../api/src/lifecycle/survive-lost-connections';
import { startEmbeddedWorker } from '../api/src/workers/embedded-worker';
import { warmInteractivePool } from '../api/src/workers/interactive-pool';
import { startCluster, type PgCluster } from './postgres';
import { ensureWebBuild } from './web-build';

const ROOT = resolve(__dirname, '..');
const PRIVATE_PG_PORT = 54329;
const PRIVATE_DB = 'quarterturn';

/** Creates database `name` in the cluster unless it exists. */
async function ensureDatabase(cluster: PgCluster, name: string): Promise<void> {
  const client = new Client({ connectionString: cluster.adminUrl });
  await client.connect();
  try {
    const found = await client.query('SELECT 1 FROM pg_database WHERE datname = $1', [name]);
    if (found.rowCount === 0) await client.query(`CREATE DATABASE "${name}"`);
  } finally {
    await client.end();
  }
}

async function main(): Promise<void> {
  process.chdir(ROOT);
  const { config, warnings } = loadConfig();
  const logger = createLogger(config.logLevel);
  surviveLostConnections(logger);
  for (const w of warnings) logger.warn(w);
  const steps: ShutdownStep[] = [];
  let cluster: PgCluster | undefined;

  try {
    let databaseUrl = config.databaseUrl;
    if (!databaseUrl) {
      cluster = startCluster(resolve(ROOT, '.data/postgres'), PRIVATE_PG_PORT, { log: (m) => logger.info(m) });
      await ensureDatabase(cluster, PRIVATE_DB);
      databaseUrl = cluster.urlFor(PRIVATE_DB);
      logger.info({ port: PRIVATE_PG_PORT }, 'private PostgreSQL cluster running (.data/postgres)');
    }
    await migrate(databaseUrl);
    const seeding = createSequelize(databaseUrl, { poolMax: 2 });
    try {
      await seedDemo(seeding);
    } finally {
      await seeding.close();
    }
    const web = ensureWebBuild({ root: ROOT, webDist: config.webDist, log: (m) => logger.info(m) });
    logger.info({ web }, 'web app build checked');

    // Without SMTP_URL, e-mail goes to a local fake SMTP server whose mailbox admins see at /sweeps/mailbox;
    // only in development mode: the mailbox holds everyone's sweep e-mail (issue 13).
    let smtpUrl = config.smtpUrl;
    const smtp = smtpUrl || !isDevelopmentMode(config) ? undefined : await startFakeSmtp(config.fakeSmtpPort);
    if (smtp) {
      smtpUrl = smtp.url;
      logger.info(`local fake SMTP server on ${smtp.url} (messages for admins at ${config.publicUrl}/sweeps/mailbox)`);
    } else if (!smtpUrl) {
      logger.warn('SMTP_URL is not set: no e-mail is sent (the local fake SMTP server runs only in development mode)');
    }
    const server = await startServer({ config: { ...config, databaseUrl, smtpUrl }, logger, mailbox: smtp?.mailbox });
    steps.push({ name: 'HTTP server, fake OAuth provider and database pools', run: () => server.close() });
    warmInteractivePool(server.app.context.interactive, logger);
    const embedded = await startEmbeddedWorker(config, databaseUrl, logger, smtpUrl);
    if (embedded) {
      steps.unshift({ name: 'embedded sweep worker', run: () => embedded.stop() });
      logger.info({ threads: embedded.worker.threads }, 'embedded sweep worker running (more workers: npm run worker)');
    }
    // The demo sweep's results come from the worker after start-up; its invented field trials follow them.
    const demoTrials = followDemoTrials(databaseUrl, logger);
    steps.unshift({ name: 'demo field trials', run: () => demoTrials.stop() });
    if (smtp) steps.push({ name: 'fake SMTP server', run: () => smtp.close() });
    if (cluster) {
      const c = cluster;
      steps.push({ name: 'private PostgreSQL cluster', run: () => c.stop() });
    }
    onShutdownSignals(logger, steps);
    if (server.fakeOAuthUrl) logger.info(`local fake sign-in provider on ${server.fakeOAuthUrl} (demo identities only)`);
    console.log(`\n  Quarterturn is running on ${server.url}  (Ctrl-C to stop)\n`);
  } catch (err) {
    // Leave no private cluster running behind a failed start.
    if (cluster) {
      try {
        cluster.stop();
      } catch {
        // already reported below
      }
    }
    throw err;
  }
}

main().catch((err: unknown) => {
  console.error(err instanceof ConfigError ? err.message : err);
  process.exit(1);
});
