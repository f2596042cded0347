/**
 * PostgreSQL LISTEN/NOTIFY channels between workers and servers. NOTIFY is delivered when the
 * sending transaction commits, to every listener on any machine that reaches the database, so
 * a progress event never announces a row that is not yet visible, and no one polls.
 */
import pg from 'pg';
import type { Logger } from 'pino';

/** Sent by a worker when a run is over: `{ sweepId, runId, isSweepOver }`. */
export const SWEEP_EVENTS_CHANNEL = 'qt_sweep_events';
/** Sent by the server when a sweep is cancelled: `{ sweepId }`; workers abort its running tasks. */
export const SWEEP_CANCEL_CHANNEL = 'qt_sweep_cancel';

/** Payload of SWEEP_EVENTS_CHANNEL. */
export interface SweepEventNotice {
  readonly sweepId: number;
  readonly runId?: number;
  readonly isSweepOver?: boolean;
}

/** A listener that reconnects on its own. */
export interface ChannelListener {
  close(): Promise<void>;
}

/**
 * Listens on `channels` with one dedicated connection; when the connection is lost (e.g. a
 * PostgreSQL restart) it calls `onLost`, reconnects with a growing delay (0.5 s … 5 s) and calls
 * `onReconnect`, so the owner can say it is out of touch and then catch up on what it missed.
 */
export function listenChannels(
  databaseUrl: string,
  channels: readonly string[],
  onNotice: (channel: string, payload: unknown) => void,
  options: { readonly logger: Logger; readonly onReconnect?: () => void; readonly onLost?: () => void },
): ChannelListener {
  let client: pg.Client | undefined;
  let isClosed = false;
  let delay = 500;
  let timer: NodeJS.Timeout | undefined;
  let isFirst = true;

  const connect = async (): Promise<void> => {
    if (isClosed) return;
    const c = new pg.Client({ connectionString: databaseUrl });
    c.on('error', () => undefined);
    c.on('end', () => {
      if (client === c) {
        client = undefined;
        if (!isClosed) options.onLost?.();
      }
      schedule();
    });
    c.on('notification', (n) => {
      let payload: unknown = n.payload;
      try {
        payload = JSON.parse(n.payload ?? 'null');
      } catch {
        // keep the raw text
      }
      onNotice(n.channel, payload);
    });
    try {
      await c.connect();
      for (const ch of channels) await c.query(`LISTEN ${ch}`);
      if (isClosed) {
        await c.end();
        return;
      }
      client = c;
      delay = 500;
      if (!isFirst) options.onReconnect?.();
      isFirst = false;
    } catch (err) {
      options.logger.debug({ err: (err as Error).message }, 'listen: cannot connect yet');
      c.end().catch(() => undefined);
      schedule();
    }
  };
  const schedule = (): void => {
    if (isClosed || timer) return;
    timer = setTimeout(() => {
      timer = undefined;
      void connect();
    }, delay);
    delay = Math.min(5000, delay * 2);
  };
  void connect();
  return {
    async close() {
      isClosed = true;
      if (timer) clearTimeout(timer);
      const c = client;
      client = undefined;
      await c?.end().catch(() => undefined);
    },
  };
}
