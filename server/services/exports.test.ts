import http from 'node:http';

import express from 'express';
import pino from 'pino';
import { describe, expect, it } from 'vitest';

import { errorHandler } from '@/server/errors';

import { streamCsv } from './exports';

describe('a CSV download that fails part-way', () => {
  it('ends where it failed (the connection closes) instead of writing an error page into the file, and the server keeps serving', async () => {
    const app = express();
    app.get('/rows.csv', async (_req, res) => {
      async function* rows() {
        for (let i = 0; i < 3000; i++) {
          if (i === 2500) throw new Error('cursor lost');
          yield { n: i, note: i === 1 ? '=SUM(A1:A9)' : 'ok' };
        }
      }
      await streamCsv(res, 'rows.csv', ['n', 'note'], rows(), (r) => [r.n, r.note]);
    });
    app.get('/ok', (_req, res) => void res.json({ ok: true }));
    app.use(errorHandler(pino({ level: 'silent' })));
    const server = app.listen(0, '127.0.0.1');
    await new Promise((r) => server.once('listening', r));
    const port = (server.address() as { port: number }).port;
    const got = await new Promise<{ body: string; aborted: boolean; status: number }>((resolve) => {
      http.get(`http://127.0.0.1:${port}/rows.csv`, (res) => {
        let body = '';
        let aborted = false;
        res.on('data', (d: Buffer) => (body += d.toString()));
        res.on('aborted', () => (aborted = true));
        res.on('error', () => (aborted = true));
        res.on('close', () => resolve({ body, aborted: aborted || !res.complete, status: res.statusCode ?? 0 }));
      });
    });
    expect(got.status).toBe(200);
    expect(got.aborted).toBe(true);
    expect(got.body.startsWith("n,note\n0,ok\n1,'=SUM(A1:A9)\n")).toBe(true);
    expect(got.body).not.toMatch(/error/i);
    const ok = await fetch(`http://127.0.0.1:${port}/ok`);
    expect(ok.status).toBe(200);
    server.close();
  });
});
