// The API bench's baseline: a bare Express app whose one route answers the same JSON body that
// GET /api/sites?limit=50 answered (read from BENCH_BODY_FILE), serialised on every request as
// a real route would. No middleware, no database: what the list route costs on top is the app.
import express from 'express';
import { readFileSync } from 'node:fs';

const body: unknown = JSON.parse(readFileSync(process.env.BENCH_BODY_FILE!, 'utf8'));
const app = express();
app.disable('x-powered-by');
app.get('/api/health', (_req, res) => {
  res.json({ ok: true });
});
app.get('/api/sites', (_req, res) => {
  res.json(body);
});
const server = app.listen(Number(process.env.PORT), '127.0.0.1');
process.on('SIGTERM', () => server.close(() => process.exit(0)));
