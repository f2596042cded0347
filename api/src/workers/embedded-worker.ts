/** The sweep worker a server process runs beside the API (EMBEDDED_WORKER, default on), so one machine completes sweeps alone. */
import type { Logger } from 'pino';
import type { AppConfig } from '../config';
import { createMailer, type Mailer } from '../mail/mailer';
import { defaultThreadCount } from './machine-info';
import { startSweepWorker, type SweepWorker } from './sweep-worker';

/** A running embedded worker and its mailer. */
export interface EmbeddedWorker {
  readonly worker: SweepWorker;
  stop(): Promise<void>;
}

/** Starts the embedded worker unless the config turns it off (then undefined). */
export async function startEmbeddedWorker(config: AppConfig, databaseUrl: string, logger: Logger, smtpUrl = config.smtpUrl): Promise<EmbeddedWorker | undefined> {
  if (!config.isEmbeddedWorker) return undefined;
  const mailer: Mailer | undefined = smtpUrl ? createMailer(smtpUrl) : undefined;
  const worker = await startSweepWorker({
    databaseUrl, threads: config.workerThreads ?? defaultThreadCount(), logger, mailer, publicUrl: config.publicUrl,
    solvers: config.workerSolvers,
  });
  return {
    worker,
    async stop() {
      await worker.stop({ graceful: true, timeoutMs: 10_000 });
      mailer?.close();
    },
  };
}
