// The yardstick of `npm run bench`: a bare Express 5 app from the same node_modules, with
// express.json() and one POST handler (and one GET), printing its URL once it listens.
import express from 'express';

const app = express();
app.use(express.json());
app.get('/get', (_req, res) => {
  res.json({ status: 'ok' });
});
app.post('/post', (req, res) => {
  res.json({ received: Object.keys(req.body ?? {}).length });
});
const server = app.listen(0, '127.0.0.1', () => {
  process.stdout.write(`listening at http://127.0.0.1:${server.address().port}\n`);
});
process.on('SIGTERM', () => server.close(() => process.exit(0)));
