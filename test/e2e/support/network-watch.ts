/** Records every request a page makes, to prove the app never talks to a host other than loopback. */
import type { Page } from 'playwright-core';

/** Requests seen so far, split into loopback ones and the rest. */
export interface NetworkWatch {
  /** Every http(s)/ws(s) URL the page requested. */
  readonly seen: readonly string[];
  /** Those whose host is not 127.0.0.1. */
  readonly outside: readonly string[];
}

/** Schemes that never reach the network (inline data, object URLs, blank pages). */
const LOCAL_SCHEMES = new Set(['data:', 'blob:', 'about:', 'chrome-extension:']);

/** Starts recording the page's requests (and WebSocket connections) from now on. */
export function watchNetwork(page: Page): NetworkWatch {
  const seen: string[] = [];
  const outside: string[] = [];
  const record = (url: string): void => {
    const parsed = new URL(url);
    if (LOCAL_SCHEMES.has(parsed.protocol)) return;
    seen.push(url);
    if (parsed.hostname !== '127.0.0.1') outside.push(url);
  };
  page.on('request', (req) => record(req.url()));
  page.on('websocket', (ws) => record(ws.url()));
  return { seen, outside };
}
