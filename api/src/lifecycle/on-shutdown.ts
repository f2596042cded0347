/** Clean stop on Ctrl-C / SIGTERM: runs the shutdown steps in order, once; a second signal forces exit. */
import type { Logger } from 'pino';

/** A named shutdown step. */
export interface ShutdownStep {
  readonly name: string;
  run(): Promise<void> | void;
}

/** Installs SIGINT/SIGTERM handlers that run `steps` and then exit with code 0 (1 if a step failed). */
export function onShutdownSignals(logger: Logger, steps: readonly ShutdownStep[]): void {
  let isStopping = false;
  const stop = async (signal: NodeJS.Signals) => {
    if (isStopping) {
      logger.warn({ signal }, 'second signal: exiting without finishing shutdown');
      process.exit(1);
    }
    isStopping = true;
    logger.info({ signal }, 'shutting down');
    let code = 0;
    for (const step of steps) {
      try {
        await step.run();
        logger.info(`stopped ${step.name}`);
      } catch (err) {
        code = 1;
        logger.error({ err }, `could not stop ${step.name}`);
      }
    }
    logger.flush();
    process.exit(code);
  };
  // One listener per signal: the first call shuts down, a later one takes the forced-exit branch.
  process.on('SIGINT', (s) => void stop(s));
  process.on('SIGTERM', (s) => void stop(s));
}
