/** The pino logger of the worker process (JSON lines on stdout). */
import { pino, type Logger } from 'pino';

export function createLogger(name: string, level: string): Logger {
  return pino({ name, level, base: { pid: process.pid }, timestamp: pino.stdTimeFunctions.isoTime });
}
