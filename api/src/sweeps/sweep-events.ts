/**
 * Live sweep progress for Server-Sent Events. Workers NOTIFY on qt_sweep_events when a run
 * is over (delivered at commit, from any machine); this hub LISTENs on one connection per app
 * process, and for each sweep someone watches sends the run's result row at once and a progress
 * snapshot at most every PROGRESS_INTERVAL_MS (so a burst of fast runs costs one count query).
 *
 * Why LISTEN/NOTIFY rather than polling: workers may run on other machines and NOTIFY reaches
 * every server without extra infrastructure; nothing is read while nobody watches; and after a
 * lost connection the hub reconnects and resends every watched sweep's snapshot.
 *
 * Access is checked again before every event and every heartbeat, with roles read afresh from
 * the database (`allowedViewers`, the rule of sweep-access.ts): a watcher who may no longer see
 * the sweep (demoted, or the set turned private) gets nothing more and his stream is ended. Role
 * changes may happen on another server, so the hub asks instead of waiting to be told. When the
 * check itself fails (database down) no data is sent, but streams stay open: losing the database
 * sends every watcher an `unavailable` event, and the snapshots resent on reconnecting end it.
 * A stream opened with a personal API token is also ended once that token is revoked or expires
 * (checked at the same moments): revoking a token must cut every door it opened.
 */
import type { Response } from 'express';
import type { Logger } from 'pino';
import { QueryTypes, type Sequelize } from 'sequelize';
import { isSweepOver, SWEEP_EVENT_NAMES } from '@shared/runs';
import { listenChannels, SWEEP_EVENTS_CHANNEL, type ChannelListener, type SweepEventNotice } from '../workers/sweep-channels';
import { readProgress, readResultRows } from './sweep-progress';

/** Minimum spacing of progress events of one sweep, ms. */
export const PROGRESS_INTERVAL_MS = 250;
const HEARTBEAT_MS = 15_000;

/** The SSE hub of one app. */
export interface SweepEvents {
  /**
   * Streams sweep `sweepId` to `res`, watched by account `viewerId` (through API token `tokenId` when
   * the request carried one), until the client goes away or loses access.
   */
  stream(sweepId: number, res: Response, viewerId: number, tokenId?: number): Promise<void>;
  close(): Promise<void>;
}

/** Which of the accounts `userIds` may see sweep `sweepId` now (SweepsService.allowedViewers). */
export type AllowedViewers = (sweepId: number, userIds: readonly number[]) => Promise<Set<number>>;

/** One open stream. */
interface Watcher {
  readonly res: Response;
  readonly viewerId: number;
  /** The API token the stream was opened with, if any. */
  readonly tokenId?: number;
}

/** Which of the API tokens `ids` are still live (neither revoked nor expired). */
async function liveTokens(sequelize: Sequelize, ids: readonly number[]): Promise<Set<number>> {
  if (ids.length === 0) return new Set();
  const rows = await sequelize.query<{ id: number }>(
    'SELECT id FROM api_tokens WHERE id IN (:ids) AND revoked_at IS NULL AND expires_at > now()',
    { type: QueryTypes.SELECT, replacements: { ids: [...ids] } },
  );
  return new Set(rows.map((r) => r.id));
}

/** Builds the hub; it connects to `databaseUrl` when the first client arrives. */
export function createSweepEvents(sequelize: Sequelize, databaseUrl: string | undefined, logger: Logger, allowedViewers: AllowedViewers): SweepEvents {
  const watchers = new Map<number, Set<Watcher>>();
  const pendingProgress = new Map<number, NodeJS.Timeout>();
  let listener: ChannelListener | undefined;
  let heartbeat: NodeJS.Timeout | undefined;

  const forget = (sweepId: number, watcher: Watcher): void => {
    const set = watchers.get(sweepId);
    set?.delete(watcher);
    if (set && set.size === 0) watchers.delete(sweepId);
    if (watchers.size === 0 && heartbeat) {
      clearInterval(heartbeat);
      heartbeat = undefined;
    }
  };
  /** The watchers of `sweepId` who may still see it; the others' streams are ended. */
  const authorised = async (sweepId: number): Promise<Watcher[]> => {
    const current = [...(watchers.get(sweepId) ?? [])];
    if (current.length === 0) return [];
    const tokenIds = [...new Set(current.flatMap((w) => (w.tokenId === undefined ? [] : [w.tokenId])))];
    const [allowed, live] = await Promise.all([
      allowedViewers(sweepId, [...new Set(current.map((w) => w.viewerId))]),
      liveTokens(sequelize, tokenIds),
    ]);
    const mayWatch = (w: Watcher) => allowed.has(w.viewerId) && (w.tokenId === undefined || live.has(w.tokenId));
    for (const w of current.filter((x) => !mayWatch(x))) {
      const why = allowed.has(w.viewerId) ? 'its API token was revoked or expired' : 'the viewer may no longer see the sweep';
      logger.info({ sweepId, userId: w.viewerId, tokenId: w.tokenId }, `sweep stream ended: ${why}`);
      forget(sweepId, w);
      w.res.end();
    }
    return current.filter((w) => mayWatch(w) && watchers.get(sweepId)?.has(w));
  };
  const send = (to: readonly Watcher[], event: string, data: unknown): void => {
    const text = `event: ${event}\ndata: ${JSON.stringify(data)}\n\n`;
    for (const w of to) w.res.write(text);
  };
  const sendProgress = async (sweepId: number): Promise<void> => {
    const [progress, to] = await Promise.all([readProgress(sequelize, sweepId), authorised(sweepId)]);
    if (progress) send(to, SWEEP_EVENT_NAMES.progress, progress);
  };
  /** Re-checks every watched sweep and keeps the allowed streams alive through proxies. */
  const beat = (): void => {
    for (const sweepId of watchers.keys()) {
      authorised(sweepId)
        .then((to) => to.forEach((w) => w.res.write(': keep-alive\n\n')))
        .catch((err: Error) => {
          logger.warn({ err: err.message, sweepId }, 'sweep stream access check failed');
          watchers.get(sweepId)?.forEach((w) => w.res.write(': keep-alive\n\n'));
        });
    }
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
      Promise.all([readResultRows(sequelize, sweepId, { runId }), authorised(sweepId)])
        .then(([rows, to]) => rows.forEach((row) => send(to, SWEEP_EVENT_NAMES.result, row)))
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
      // No figures can be read until then; say so rather than let pages show stale ones as live.
      onLost: () => watchers.forEach((set) => set.forEach((w) => w.res.write(`event: ${SWEEP_EVENT_NAMES.unavailable}\ndata: {}\n\n`))),
    });
  };

  return {
    async stream(sweepId, res, viewerId, tokenId) {
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
      const watcher: Watcher = { res, viewerId, tokenId };
      set.add(watcher);
      heartbeat ??= setInterval(beat, HEARTBEAT_MS);
      res.on('close', () => forget(sweepId, watcher));
      const progress = await readProgress(sequelize, sweepId);
      if (progress) res.write(`event: ${SWEEP_EVENT_NAMES.progress}\ndata: ${JSON.stringify(progress)}\n\n`);
      if (progress && isSweepOver(progress.status)) res.write(': sweep over\n\n');
    },
    async close() {
      for (const t of pendingProgress.values()) clearTimeout(t);
      pendingProgress.clear();
      if (heartbeat) clearInterval(heartbeat);
      heartbeat = undefined;
      for (const set of watchers.values()) for (const w of set) w.res.end();
      watchers.clear();
      await listener?.close();
      listener = undefined;
    },
  };
}
