/** What every feature router and service may use, built once per app by createApp(). */
import type { Logger } from 'pino';
import type { Sequelize } from 'sequelize';
import type { AppConfig } from './config';
import type { Models } from './db/models';
import type { Mailbox } from './dev/fake-smtp/mailbox';
import type { StatsService } from './stats/stats.service';
import type { UsersService } from './users/users.service';
import type { InteractivePool } from './workers/interactive-pool';

/** Shared services of one app instance. */
export interface AppContext {
  readonly config: AppConfig;
  readonly logger: Logger;
  readonly sequelize: Sequelize;
  readonly models: Models;
  readonly users: UsersService;
  /** Register home-page counters here (`stats.register('sweeps', ...)`). */
  readonly stats: StatsService;
  readonly version: string;
  /** Registers a close step run by app.dispose() (features that open connections of their own). */
  readonly onDispose: (close: () => Promise<void>) => void;
  /** The worker pool of work a request waits on (executions, generation): handlers await it instead of computing inline. */
  readonly interactive: InteractivePool;
  /** The local fake SMTP server's mailbox, when one runs (development and tests only). */
  readonly mailbox?: Mailbox;
}
