/**
 * The shared event-stream reader (contract/event-stream.ts) against the `text/event-stream` format of the
 * WHATWG HTML Standard §9.2 ("Server-sent events", parsing an event stream / interpreting an event stream).
 * The streams below follow the standard's own examples; they are written from memory of that section, not
 * copied, so each check names the rule it exercises.
 */
import { describe, expect, it } from 'vitest';
import { EventStreamParser, readEventStream, type EventStreamBlock } from '../../contract/event-stream.ts';

const all = (chunks: readonly string[]): EventStreamBlock[] => {
  const parser = new EventStreamParser();
  return chunks.flatMap((c) => parser.push(c));
};

describe('EventStreamParser', () => {
  it('should join several data lines with LF (WHATWG §9.2: data buffer gets value + LF per line, last LF removed)', () => {
    expect(all(['data: YHOO\ndata: +2\ndata: 10\n\n'])).toEqual([{ event: 'message', data: 'YHOO\n+2\n10', retryMs: null }]);
  });

  it('should skip comments, strip only one leading space and ignore unknown fields (§9.2 field rules)', () => {
    const blocks = all([': heartbeat\n\n', 'data: first\nid: 1\n\n', 'data:second\nid\n\n', 'data:  third\n\n']);
    expect(blocks.map((b) => b.data)).toEqual(['first', 'second', ' third']);
  });

  it('should treat a line with no colon as a field name with an empty value (§9.2)', () => {
    expect(all(['data\n\ndata\ndata\n\n']).map((b) => b.data)).toEqual(['', '\n']);
  });

  it('should not dispatch a block that has not ended with a blank line (§9.2: end of stream discards it)', () => {
    expect(all(['event: progress\ndata: {"a":1}\n'])).toEqual([]);
  });

  it('should accept CR LF, CR and LF line ends, also a CR LF split across chunks (§9.2 end-of-line rule)', () => {
    const blocks = all(['event: end\r', '\ndata: 1\r\r', 'event: progress\rdata: 2\r\n', '\r\n']);
    expect(blocks).toEqual([
      { event: 'end', data: '1', retryMs: null },
      { event: 'progress', data: '2', retryMs: null },
    ]);
  });

  it('should take a retry made only of ASCII digits and ignore any other (§9.2 retry field)', () => {
    expect(all(['retry: 3000\n\n', 'retry: 3s\ndata: x\n\n']).map((b) => b.retryMs)).toEqual([3000, null]);
  });
});

describe('readEventStream', () => {
  it('should read blocks from a byte stream whose chunks split a multi-byte UTF-8 character', async () => {
    const bytes = new TextEncoder().encode('event: note\ndata: Δv\n\n');
    const at = bytes.indexOf(0xce) + 1; // inside the two-byte 'Δ'
    const body = new ReadableStream<Uint8Array>({
      start(c) { c.enqueue(bytes.slice(0, at)); c.enqueue(bytes.slice(at)); c.close(); },
    });
    const blocks: EventStreamBlock[] = [];
    for await (const b of readEventStream(body)) blocks.push(b);
    expect(blocks).toEqual([{ event: 'note', data: 'Δv', retryMs: null }]);
  });
});
