// The floor for any API read here: bare Express 5 + pg answering one indexed row as JSON, in its
// own process, against the same PostgreSQL as the app. Started by docker-free-scripts/bench-api.sh.
//   DATABASE_URL=postgres://… [PORT=…] [PORT_FILE=…] node server/bench/baseline.mjs
import { writeFileSync } from 'node:fs';
import express from 'express';
import pg from 'pg';

const pool = new pg.Pool({ connectionString: process.env.DATABASE_URL, max: 10 });
const app = express();
app.get('/row/:id', async (req, res) => {
  const { rows } = await pool.query('SELECT id, number, title, state, booked_in_on, due_on, updated_at FROM jobs WHERE id = $1', [req.params.id]);
  if (rows.length === 0) return void res.status(404).json({ error: 'not found' });
  res.json(rows[0]);
});
// PORT=0 (the default) takes any free port; the script reads it from PORT_FILE.
const server = app.listen(Number(process.env.PORT ?? 0), '127.0.0.1', () => {
  const { port } = server.address();
  if (process.env.PORT_FILE) writeFileSync(process.env.PORT_FILE, String(port));
  console.log(`baseline listening on ${port}`);
});
process.on('SIGTERM', () => {
  server.closeAllConnections();
  server.close(() => pool.end().then(() => process.exit(0)));
});
