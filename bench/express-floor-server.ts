/**
 * The floor peer of bench:service: the same express 5 with nothing but one route, GET /floor answering a fixed
 * JSON body — no security headers, body parser, token, rate limit, metrics, log or Redis. What it costs per
 * request is what any route of this framework costs on this machine before the route does anything; the
 * submission's latency is read against it. Listens on PORT (127.0.0.1) and prints "listening" when ready.
 */
import express from 'express';

const app = express();
app.get('/floor', (_req, res) => { res.json({ status: 'ok' }); });
const server = app.listen(Number(process.env.PORT ?? 0), '127.0.0.1', () => process.stdout.write('listening\n'));
process.on('SIGTERM', () => server.close(() => process.exit(0)));
