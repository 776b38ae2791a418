// The yardstick for bench/board.ts: a bare Express route serving, from memory, the same JSON the
// board read returns. Run as a child process: node --import tsx bench/bare-server.ts <json-file> <port>
import express from 'express';
import { readFileSync } from 'node:fs';

const [file, port] = process.argv.slice(2);
const body = JSON.parse(readFileSync(file, 'utf8'));
const app = express();
app.disable('x-powered-by');
app.get('/api/board', (_req, res) => {
  res.json(body);
});
app.listen(Number(port), '127.0.0.1', () => console.log(`bare route on ${port}`));
