/** The pino logger of the API and worker processes (JSON lines on stdout). */
import { pino, type Logger } from 'pino';

/**
 * Writes asynchronously: pino's default stdout destination writes each line synchronously, so a slow reader
 * of the pipe (a log shipper) would stall the event loop that serves requests and renews queue locks. pino
 * flushes the pending lines when the process exits.
 */
export function createLogger(name: string, level: string): Logger {
  return pino(
    { name, level, base: { pid: process.pid }, timestamp: pino.stdTimeFunctions.isoTime },
    pino.destination({ dest: 1, sync: false }),
  );
}
