/**
 * The ceilings the benchmark compares Tacklog's HTTP paths with: an Express app with nothing but
 * a JSON body parser — no sign-in, no checks, no security headers, no log, no mapping of rows —
 * started by scripts/bench.ts as a child process on PORT, printing "ready" once listening:
 *  - POST /echo answers a small JSON object: what this machine allows an Express request before
 *    any work;
 *  - POST /ceiling/lookup runs the scan lookup's own statement (CONTAINER_BY_CODE, as a named
 *    prepared statement on the app's pool) and answers its row: what Express and
 *    node-postgres allow a lookup on this machine before Tacklog does anything of its own;
 *  - POST /ceiling/reading writes a reading and its audit row in one statement, as the app's
 *    reading does: the same for a write of one round trip;
 *  - POST /ceiling/stations/:id/load runs a station load's own two statements (the context with
 *    the Idempotency-Key's claim, then the writes: container opened, load, two audit rows sealed
 *    into the chain, the answer stored for the key), with the actor named by the bearer "token"
 *    and none of the load's checks: what a load's database work allows on this machine.
 * With DATABASE_URL or TACKLOG_BENCH_ACTOR_ID unset only /echo is served.
 */
import crypto from 'node:crypto';
import express from 'express';
import { httpServerFor } from '../../server/http-server';

const app = express();
app.disable('x-powered-by');
app.set('etag', false);
app.use(express.json());
app.post('/echo', (req, res) => {
  res.json({ ok: true, code: (req.body as { code?: unknown }).code ?? null });
});

const url = process.env.DATABASE_URL;
const actorId = process.env.TACKLOG_BENCH_ACTOR_ID;
if (url && actorId) {
  // The app's own pool (server/db/client, from DATABASE_URL) and named statements.
  const { db, pool } = await import('../../server/db/client');
  const { namedStatement } = await import('../../server/db/named');
  const { CONTAINER_BY_CODE } = await import('../../server/services/scans/resolvers/container');
  const lookup = namedStatement<{ code: string }, Record<string, unknown>>('ceiling_lookup', CONTAINER_BY_CODE);
  const readingText = `
    WITH saved AS (
      INSERT INTO readings (id, area, at, temp_c, rh_pct, source, recorded_by)
      VALUES ($1::uuid, $2, $3::timestamptz, $4, $5, 'manual', $6::uuid) RETURNING id
    )
    INSERT INTO audit_log (actor_id, action, entity_type, entity_id, after)
    SELECT $6::uuid, 'reading.record', 'reading', s.id::text, $7::jsonb FROM saved s`;
  const { loadStatementsForBenchmark: load } = await import('../../server/services/loading/load');
  app.post('/ceiling/stations/:id/load', async (req, res, next) => {
    try {
      const actor = (req.get('authorization') ?? '').slice('Bearer '.length);
      const key = req.get('idempotency-key') ?? null;
      const { batchId, containerCode } = req.body as { batchId: string; containerCode: string };
      const stationId = req.params.id;
      const [ctx] = await load.context(db, {
        stationId,
        batchId,
        containerCode,
        idemKey: key,
        idemActor: key && actor,
        idemMethod: key && 'POST',
        idemPath: key && req.path,
        idemHash: key && 'ceiling',
      });
      const container = ctx.container as { id: string; status: string } | null;
      if (!container) {
        res.status(404).json({ error: 'no such container' });
        return;
      }
      const now = new Date();
      const loadId = crypto.randomUUID();
      const opened = container.status === 'sealed';
      const answer = { id: loadId, stationId, batchId, containerId: container.id, loadedAt: now.toISOString(), opened };
      const written = await load.write(db, {
        actorId: actor,
        stationId,
        stationCode: ctx.station_code,
        batchId,
        containerId: container.id,
        containerVersion: ctx.container_version,
        mixId: null,
        openContainer: opened,
        now,
        loadId,
        idemKey: key,
        idemActor: key && actor,
        answer: key && JSON.stringify(answer),
      });
      if (!written.ok) res.status(409).json({ error: 'the container changed' });
      else res.json(answer);
    } catch (err) {
      next(err);
    }
  });
  app.post('/ceiling/lookup', async (req, res, next) => {
    try {
      const [row] = await lookup(db, { code: (req.body as { code: string }).code });
      if (!row) res.status(404).json({ error: 'no such container' });
      else res.json(row);
    } catch (err) {
      next(err);
    }
  });
  app.post('/ceiling/reading', async (req, res, next) => {
    try {
      const b = req.body as { area: string; at: string; tempC: number; rhPct: number };
      const reading = { id: crypto.randomUUID(), area: b.area, at: new Date(b.at).toISOString(), tempC: b.tempC, rhPct: b.rhPct };
      await pool.query({
        name: 'ceiling_reading',
        text: readingText,
        values: [reading.id, reading.area, reading.at, reading.tempC, reading.rhPct, actorId, JSON.stringify(reading)],
      });
      res.status(201).json(reading);
    } catch (err) {
      next(err);
    }
  });
}
// Served as Tacklog is (server/http-server.ts): the ceiling must not carry a cost the app avoids.
const server = httpServerFor(app).listen(Number(process.env.PORT), '127.0.0.1', () => console.log('ready'));
process.on('SIGTERM', () => server.close(() => process.exit(0)));
