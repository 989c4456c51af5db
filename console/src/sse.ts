/**
 * Server-sent events over fetch (EventSource cannot send an Authorization header). Parses the
 * `event:` / `data:` blocks of the WHATWG event-stream format and reconnects after a dropped stream
 * until the server sends `end` or the caller aborts.
 */
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
      const reader = res.body.pipeThrough(new TextDecoderStream()).getReader();
      let buffer = '';
      for (;;) {
        const { value, done } = await reader.read();
        if (done) break;
        buffer += value.replace(/\r\n/g, '\n');
        let cut: number;
        while ((cut = buffer.indexOf('\n\n')) >= 0) {
          const block = buffer.slice(0, cut);
          buffer = buffer.slice(cut + 2);
          let event = 'message';
          const data: string[] = [];
          for (const line of block.split('\n')) {
            if (line.startsWith('event:')) event = line.slice(6).trim();
            else if (line.startsWith('data:')) data.push(line.slice(5).replace(/^ /, ''));
            else if (line.startsWith('retry:')) retryMs = Number(line.slice(6)) || retryMs;
          }
          if (data.length === 0) continue;
          let parsed: unknown;
          try { parsed = printableJson(JSON.parse(data.join('\n')) as unknown); } catch { parsed = printableText(data.join('\n')); }
          if (event === 'end') ended = true;
          handlers.onEvent(event, parsed);
        }
      }
    } catch (error) {
      if (signal.aborted) return;
      handlers.onDrop?.(error);
    }
    if (!ended && !signal.aborted) setTimeout(() => { if (!signal.aborted) void run(); }, retryMs);
  };
  void run();
}
