/**
 * `npm run worker`: a stand-alone sweep worker on this machine, for DATABASE_URL. Start as many
 * as you like on machines that reach the database; each takes run jobs until Ctrl-C / SIGTERM,
 * which finishes the running ones first (a second signal stops at once; those runs are retried).
 */
import { createLogger } from '../http/logger';
import { surviveLostConnections } from '../lifecycle/survive-lost-connections';
import { createMailer } from '../mail/mailer';
import { startSweepWorker } from './sweep-worker';
import { loadWorkerConfig } from './worker-config';

async function main(): Promise<void> {
  const config = loadWorkerConfig();
  const logger = createLogger(config.logLevel);
  surviveLostConnections(logger);
  const mailer = config.smtpUrl ? createMailer(config.smtpUrl) : undefined;
  const worker = await startSweepWorker({
    databaseUrl: config.databaseUrl, threads: config.threads, logger, mailer, publicUrl: config.publicUrl,
    maintenanceSeconds: config.maintenanceSeconds, solvers: config.solvers,
  });
  let signals = 0;
  const stop = (signal: string) => {
    signals++;
    logger.info({ signal }, signals === 1 ? 'stopping: finishing running runs' : 'stopping now');
    worker.stop({ graceful: signals === 1 }).then(() => {
      mailer?.close();
      process.exit(0);
    }, () => process.exit(1));
    if (signals > 1) setTimeout(() => process.exit(1), 5000).unref();
  };
  process.on('SIGINT', () => stop('SIGINT'));
  process.on('SIGTERM', () => stop('SIGTERM'));
  console.log(`worker ${worker.name} ready with ${worker.threads} thread(s)${config.solvers.length > 0 ? ` and external solvers ${config.solvers.map((r) => `${r.name}@${r.version}`).join(', ')}` : ''}`);
}

main().catch((err: unknown) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
