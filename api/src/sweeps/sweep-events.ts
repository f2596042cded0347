/**
 * Live sweep progress for Server-Sent Events. Workers NOTIFY on qt_sweep_events when a run
 * is over (delivered at commit, from any machine); this hub LISTENs on one connection per app
 * process, and for each sweep someone watches sends the run's result row at once and a progress
 * snapshot at most every PROGRESS_INTERVAL_MS (so a burst of fast runs costs one count query).
 *
 * Why LISTEN/NOTIFY rather than polling: workers may run on other machines and NOTIFY reaches
 * every server without extra infrastructure; nothing is read while nobody watches; and after a
 * lost connection the hub reconnects and resends every watched sweep's snapshot.
 */
import type { Response } from 'express';
import type { Logger } from 'pino';
import type { Sequelize } from 'sequelize';
import { isSweepOver, SWEEP_EVENT_NAMES } from '@shared/runs';
import { listenChannels, SWEEP_EVENTS_CHANNEL, type ChannelListener, type SweepEventNotice } from '../workers/sweep-channels';
import { readProgress, readResultRows } from './sweep-progress';

/** Minimum spacing of progress events of one sweep, ms. */
export const PROGRESS_INTERVAL_MS = 250;
const HEARTBEAT_MS = 15_000;

/** The SSE hub of one app. */
export interface SweepEvents {
  /** Streams sweep `sweepId` to `res` until the client goes away. */
  stream(sweepId: number, res: Response): Promise<void>;
  close(): Promise<void>;
}

/** Builds the hub; it connects to `databaseUrl` when the first client arrives. */
export function createSweepEvents(sequelize: Sequelize, databaseUrl: string | undefined, logger: Logger): SweepEvents {
  const watchers = new Map<number, Set<Response>>();
  const pendingProgress = new Map<number, NodeJS.Timeout>();
  let listener: ChannelListener | undefined;

  const send = (sweepId: number, event: string, data: unknown): void => {
    const text = `event: ${event}\ndata: ${JSON.stringify(data)}\n\n`;
    for (const res of watchers.get(sweepId) ?? []) res.write(text);
  };
  const sendProgress = async (sweepId: number): Promise<void> => {
    const progress = await readProgress(sequelize, sweepId);
    if (progress) send(sweepId, SWEEP_EVENT_NAMES.progress, progress);
  };
  const queueProgress = (sweepId: number): void => {
    if (pendingProgress.has(sweepId)) return;
    pendingProgress.set(sweepId, setTimeout(() => {
      pendingProgress.delete(sweepId);
      sendProgress(sweepId).catch((err: Error) => logger.warn({ err: err.message, sweepId }, 'sweep progress read failed'));
    }, PROGRESS_INTERVAL_MS));
  };
  const onNotice = (_channel: string, payload: unknown): void => {
    const notice = payload as SweepEventNotice | null;
    if (!notice || typeof notice.sweepId !== 'number' || !watchers.has(notice.sweepId)) return;
    const { sweepId, runId } = notice;
    if (typeof runId === 'number') {
      readResultRows(sequelize, sweepId, { runId })
        .then((rows) => rows.forEach((row) => send(sweepId, SWEEP_EVENT_NAMES.result, row)))
        .catch((err: Error) => logger.warn({ err: err.message, sweepId }, 'sweep result read failed'));
    }
    queueProgress(sweepId);
  };
  const ensureListening = (): void => {
    if (listener || !databaseUrl) return;
    listener = listenChannels(databaseUrl, [SWEEP_EVENTS_CHANNEL], onNotice, {
      logger,
      // Events sent while the connection was down are lost: resend every snapshot.
      onReconnect: () => watchers.forEach((_s, id) => queueProgress(id)),
    });
  };

  return {
    async stream(sweepId, res) {
      ensureListening();
      res.status(200);
      res.setHeader('content-type', 'text/event-stream; charset=utf-8');
      res.setHeader('cache-control', 'no-cache, no-transform');
      res.setHeader('connection', 'keep-alive');
      // Tell proxies not to buffer the stream.
      res.setHeader('x-accel-buffering', 'no');
      res.flushHeaders();
      res.write('retry: 2000\n\n');
      let set = watchers.get(sweepId);
      if (!set) {
        set = new Set();
        watchers.set(sweepId, set);
      }
      set.add(res);
      const heartbeat = setInterval(() => res.write(': keep-alive\n\n'), HEARTBEAT_MS);
      res.on('close', () => {
        clearInterval(heartbeat);
        const s = watchers.get(sweepId);
        s?.delete(res);
        if (s && s.size === 0) watchers.delete(sweepId);
      });
      const progress = await readProgress(sequelize, sweepId);
      if (progress) res.write(`event: ${SWEEP_EVENT_NAMES.progress}\ndata: ${JSON.stringify(progress)}\n\n`);
      if (progress && isSweepOver(progress.status)) res.write(': sweep over\n\n');
    },
    async close() {
      for (const t of pendingProgress.values()) clearTimeout(t);
      pendingProgress.clear();
      for (const set of watchers.values()) for (const res of set) res.end();
      watchers.clear();
      await listener?.close();
      listener = undefined;
    },
  };
}
