/** Reads a board view, its scope and its row window from a request's query string (400 on a bad parameter). */
import { BEST_AMONG, parseView, ViewParamError, type BestAmong, type LeaderboardView } from '@shared/leaderboards';
import { AppError } from '../errors/app-error';
import type { RowWindow, ViewScope } from './view-sql';

/** Largest page the grid may ask for. */
export const MAX_PAGE_ROWS = 500;

/** The query string as single strings (a repeated parameter keeps its last value). */
export function flatQuery(query: unknown): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [k, v] of Object.entries((query ?? {}) as Record<string, unknown>)) {
    if (typeof v === 'string') out[k] = v;
    else if (Array.isArray(v) && typeof v[v.length - 1] === 'string') out[k] = v[v.length - 1] as string;
    else throw new AppError('VALIDATION_FAILED', 400, `Query parameter "${k}" must be text`, [{ param: k }]);
  }
  return out;
}

/** The view of `params`, or 400 VALIDATION_FAILED naming the parameter. */
export function viewOf(params: Record<string, string>): LeaderboardView {
  try {
    return parseView(params);
  } catch (err) {
    if (err instanceof ViewParamError) throw new AppError('VALIDATION_FAILED', 400, `Query parameter "${err.param}": ${err.message}`, [{ param: err.param }]);
    throw err;
  }
}

const whole = (params: Record<string, string>, name: string, fallback: number): number => {
  const raw = params[name];
  if (raw === undefined) return fallback;
  if (!/^\d{1,9}$/.test(raw)) throw new AppError('VALIDATION_FAILED', 400, `Query parameter "${name}" must be a whole number, got "${raw}"`, [{ param: name }]);
  return Number(raw);
};

/** The scope parameters `mapId` and `profile` (a 16-hex-digit robot profile hash). */
export function scopeOf(params: Record<string, string>): ViewScope {
  const profile = params['profile'];
  if (profile !== undefined && !/^[0-9a-f]{16}$/.test(profile)) {
    throw new AppError('VALIDATION_FAILED', 400, `Query parameter "profile" must be a robot profile hash (16 hex digits), got "${profile}"`, [{ param: 'profile' }]);
  }
  const mapId = params['mapId'] === undefined ? undefined : whole(params, 'mapId', 0);
  return { ...(mapId !== undefined ? { mapId } : {}), ...(profile !== undefined ? { profileHash: profile } : {}) };
}

/** The rows window `start`..`end` (end exclusive, at most `max` rows; default the first 100). */
export function windowOf(params: Record<string, string>, max = MAX_PAGE_ROWS): RowWindow {
  const start = whole(params, 'start', 0);
  const end = whole(params, 'end', start + Math.min(100, max));
  if (end <= start) throw new AppError('VALIDATION_FAILED', 400, `Query parameter "end" (${end}) must be greater than "start" (${start})`, [{ param: 'end' }]);
  if (end - start > max) throw new AppError('VALIDATION_FAILED', 400, `At most ${max} rows per request; asked for ${end - start}`, [{ param: 'end' }]);
  return { start, end };
}

/** The `bestAmong` parameter of the summary (default `executable`), or 400 naming it. */
export function bestAmongOf(params: Record<string, string>): BestAmong {
  const raw = params['bestAmong'] ?? 'executable';
  if (!(BEST_AMONG as readonly string[]).includes(raw)) {
    throw new AppError('VALIDATION_FAILED', 400, `Query parameter "bestAmong" must be one of ${BEST_AMONG.join(', ')}, got "${raw}"`, [{ param: 'bestAmong' }]);
  }
  return raw as BestAmong;
}
