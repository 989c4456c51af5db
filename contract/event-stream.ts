/**
 * The one reader of the `text/event-stream` format (WHATWG HTML §9.2 "Server-sent events") used by both ends
 * that follow the API's progress stream: the CLI (`veer watch`) and the browser console. Text in, blocks out;
 * no Node API and no fetch here, so each side keeps its own transport (a Node response body, a browser
 * ReadableStream) and feeds decoded text to one parser.
 */

/** One dispatched block of the stream. `data` is the `data:` lines joined by '\n' (null when the block had
 * none); `retryMs` is the block's `retry:` value in milliseconds when it carried a valid one. */
export interface EventStreamBlock {
  event: string;
  data: string | null;
  retryMs: number | null;
}

/** Incremental parser: `push` decoded text as it arrives and take the complete blocks it returns. A block ends
 * at a blank line; CR LF, CR and LF all end a line (a CR at a chunk's end waits for the next chunk, in case an
 * LF follows). Comment lines (`:` first) are skipped; unknown fields are ignored. */
export class EventStreamParser {
  private buffer = '';

  push(text: string): EventStreamBlock[] {
    this.buffer += text;
    // Hold back a trailing CR: it may be the first half of a CR LF split across chunks.
    const held = this.buffer.endsWith('\r') ? '\r' : '';
    const normalised = (held ? this.buffer.slice(0, -1) : this.buffer).replace(/\r\n?/g, '\n');
    const blocks: EventStreamBlock[] = [];
    let rest = normalised;
    let cut: number;
    while ((cut = rest.indexOf('\n\n')) >= 0) {
      const block = parseBlock(rest.slice(0, cut));
      rest = rest.slice(cut + 2);
      if (block) blocks.push(block);
    }
    this.buffer = rest + held;
    return blocks;
  }
}

/** Fields of one block (the text between blank lines); null when it holds nothing but comments. */
function parseBlock(text: string): EventStreamBlock | null {
  let event = 'message';
  const data: string[] = [];
  let retryMs: number | null = null;
  let any = false;
  for (const line of text.split('\n')) {
    if (line === '' || line.startsWith(':')) continue; // comment (heartbeat)
    const colon = line.indexOf(':');
    const field = colon < 0 ? line : line.slice(0, colon);
    const value = colon < 0 ? '' : line.slice(colon + 1).replace(/^ /, '');
    any = true;
    if (field === 'event') event = value || 'message';
    else if (field === 'data') data.push(value);
    else if (field === 'retry' && /^\d+$/.test(value)) retryMs = Number(value);
  }
  return any ? { event, data: data.length > 0 ? data.join('\n') : null, retryMs } : null;
}

/** Reads a fetch response body (a WHATWG ReadableStream, the same in Node 20 and the browser) as an event
 * stream until it closes. Leaving the loop early cancels the stream, so the connection is let go. */
export async function* readEventStream(body: ReadableStream<Uint8Array>): AsyncGenerator<EventStreamBlock> {
  const reader = body.getReader();
  const decoder = new TextDecoder();
  const parser = new EventStreamParser();
  let done = false;
  try {
    for (;;) {
      const next = await reader.read();
      if (next.done) { done = true; return; }
      yield* parser.push(decoder.decode(next.value, { stream: true }));
    }
  } finally {
    if (!done) await reader.cancel().catch(() => undefined);
  }
}
