import express from 'express';
import pg from 'pg';

// Baselines for the benchmark, in their own process like the app: BASELINE=static serves STATIC_DIR
// with express.static; BASELINE=bare runs QUERIES (the SQL the app's list runs) with a plain pg.Pool.
const app = express();
app.disable('x-powered-by');
if (process.env.BASELINE === 'static') {
  app.use(express.static(process.env.STATIC_DIR!));
} else {
  const pool = new pg.Pool({ connectionString: process.env.DATABASE_URL, max: 10 });
  pool.on('error', () => undefined);
  const queries = JSON.parse(process.env.QUERIES!) as { text: string; values: unknown[] }[];
  app.get('/batches', async (_req, res) => {
    const results = [];
    for (const q of queries) results.push((await pool.query(q.text, q.values)).rows);
    res.json({ results });
  });
}
const server = app.listen(0, '127.0.0.1', () => {
  const address = server.address();
  process.stdout.write(`${JSON.stringify({ port: typeof address === 'object' && address ? address.port : 0 })}\n`);
});
