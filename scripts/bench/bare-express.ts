/**
 * The ceiling the benchmark compares Tacklog's HTTP paths with: an Express app with nothing but
 * a JSON body parser and one route answering a small JSON object — no database, no sign-in, no
 * logging. Whatever a Tacklog request does beyond that costs on top. Started by scripts/bench.ts
 * as a child process on the port given in PORT; prints "ready" once listening.
 */
import express from 'express';

const app = express();
app.disable('x-powered-by');
app.set('etag', false);
app.use(express.json());
app.post('/echo', (req, res) => {
  res.json({ ok: true, code: (req.body as { code?: unknown }).code ?? null });
});
const server = app.listen(Number(process.env.PORT), '127.0.0.1', () => console.log('ready'));
process.on('SIGTERM', () => server.close(() => process.exit(0)));
