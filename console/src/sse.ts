/**
 * Server-sent events over fetch (EventSource cannot send an Authorization header). Parses the
 * `event:` / `data:` blocks of the WHATWG event-stream format and reconnects after a dropped stream
 * until the server sends `end` or the caller aborts.
 */
import { readEventStream } from '../../contract/event-stream.ts';
import { printableJson, printableText } from '../../contract/free-text.ts';

export interface StreamHandlers {
  onEvent(event: string, data: unknown): void;
  /** The stream broke without `end`; the reader retries after `retryMs`. */
  onDrop?(error: unknown): void;
}

export function followEvents(url: string, token: string, handlers: StreamHandlers, signal: AbortSignal): void {
  let retryMs = 2000;
  const run = async (): Promise<void> => {
    let ended = false;
    try {
      const res = await fetch(url, { headers: { authorization: `Bearer ${token}`, accept: 'text/event-stream' }, signal });
      if (!res.ok || !res.body) throw new Error(`event stream answered ${res.status}`);
      for await (const block of readEventStream(res.body)) {
        if (block.retryMs !== null) retryMs = block.retryMs;
        if (block.data === null) continue;
        let parsed: unknown;
        try { parsed = printableJson(JSON.parse(block.data) as unknown); } catch { parsed = printableText(block.data); }
        if (block.event === 'end') ended = true;
        handlers.onEvent(block.event, parsed);
      }
    } catch (error) {
      if (signal.aborted) return;
      handlers.onDrop?.(error);
    }
    if (!ended && !signal.aborted) setTimeout(() => { if (!signal.aborted) void run(); }, retryMs);
  };
  void run();
}
