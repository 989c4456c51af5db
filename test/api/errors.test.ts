/**
 * The error handler: an unexpected error becomes a plain JSON 500 naming only the request id — no message
 * internals, no stack trace — while the log gets the details.
 */
import type { AddressInfo } from 'node:net';
import express from 'express';
import { pino } from 'pino';
import { describe, expect, it } from 'vitest';
import { HttpError, errorHandler } from '../../api/index.ts';

describe('error handler', () => {
  describe('when a route throws an unexpected error', () => {
    it('should answer 500 JSON without the message or stack, and log them', async () => {
      const logged: string[] = [];
      const logger = pino({ level: 'error' }, { write: (line: string) => { logged.push(line); } });
      const app = express();
      app.use((_req, res, next) => { res.locals.requestId = 'req-123'; next(); });
      app.get('/boom', () => { throw new Error('secret detail: connection string postgres://u:p@db'); });
      app.get('/teapot', () => { throw new HttpError(418, 'TEAPOT', 'short and stout'); });
      app.use(errorHandler(logger));
      const server = app.listen(0, '127.0.0.1');
      await new Promise((r) => server.once('listening', r));
      const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
      try {
        const res = await fetch(`${base}/boom`);
        const text = await res.text();
        expect(res.status).toBe(500);
        expect(JSON.parse(text)).toEqual({ error: { code: 'INTERNAL', message: 'internal error (request id req-123)' } });
        expect(text).not.toMatch(/secret|postgres|at .*:\d+/);
        expect(logged.join('')).toMatch(/secret detail/);
        const tea = await fetch(`${base}/teapot`);
        expect(tea.status).toBe(418);
        expect(await tea.json()).toEqual({ error: { code: 'TEAPOT', message: 'short and stout' } });
      } finally {
        server.close();
      }
    });
  });
});
