/** Reads a Server-Sent Events response in tests: every `event:` block received, and whether the server ended the stream. */
export interface SseEvents {
  readonly events: { event: string; data: unknown }[];
  isEnded(): boolean;
  cancel(): Promise<void>;
}

/** Starts reading `res` (a fetch response of an event stream) in the background. */
export function readEvents(res: Response): SseEvents {
  const events: { event: string; data: unknown }[] = [];
  const reader = (res.body as ReadableStream<Uint8Array>).getReader();
  let isEnded = false;
  const done = (async () => {
    let buf = '';
    for (;;) {
      const { value, done: isDone } = await reader.read();
      if (isDone) break;
      buf += Buffer.from(value).toString('utf8');
      let end: number;
      while ((end = buf.indexOf('\n\n')) >= 0) {
        const chunk = buf.slice(0, end);
        buf = buf.slice(end + 2);
        const ev = /^event: (.+)$/m.exec(chunk)?.[1];
        const data = /^data: (.+)$/m.exec(chunk)?.[1];
        if (ev && data) events.push({ event: ev, data: JSON.parse(data) });
      }
    }
    isEnded = true;
  })().catch(() => {
    isEnded = true;
  });
  return { events, isEnded: () => isEnded, cancel: async () => { await reader.cancel().catch(() => undefined); await done; } };
}
