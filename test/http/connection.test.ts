/**
 * A refused body leaves the connection usable or says it will not: after a 413 the server either
 * keeps the socket open for the next request or answers `connection: close` and closes it
 * (RFC 9112 §9.6, a server that closes says so with `close`; from memory).
 */
import { connect, type Socket } from 'node:net';
import type { ServerType } from '@hono/node-server';
import { serve } from '@hono/node-server';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/http/app.ts';

let server: ServerType;
let port = 0;

beforeAll(async () => {
  const app = createApp({ maxBodyBytes: 1000 });
  await new Promise<void>((done) => {
    server = serve({ fetch: app.fetch, port: 0, hostname: '127.0.0.1' }, (info) => {
      port = info.port;
      done();
    });
  });
});
afterAll(() => new Promise<void>((done) => server.close(() => done())));

/** Read from the socket until `until` holds of what arrived, or the socket ends. */
function readUntil(
  socket: Socket,
  until: (text: string) => boolean,
): Promise<{ text: string; ended: boolean }> {
  return new Promise((done) => {
    let text = '';
    const finish = (ended: boolean) => {
      socket.off('data', onData);
      done({ text, ended });
    };
    const onData = (d: Buffer) => {
      text += d.toString();
      if (until(text)) finish(false);
    };
    socket.on('data', onData);
    socket.once('close', () => finish(true));
  });
}

const complete = (t: string) => {
  const head = t.indexOf('\r\n\r\n');
  if (head < 0) return false;
  const len = /content-length: (\d+)/i.exec(t.slice(0, head));
  return len !== null && t.length >= head + 4 + Number(len[1]);
};

describe('after a 413', () => {
  it('says connection: close, or serves the next request on the same connection', async () => {
    const socket = connect(port, '127.0.0.1');
    socket.on('error', () => {}); // the server may close while the body is still being written
    await new Promise((r) => socket.once('connect', r));
    const big = JSON.stringify({ pad: 'x'.repeat(3_000_000) });
    socket.write(
      `POST /api/ephemeris HTTP/1.1\r\nhost: x\r\ncontent-type: application/json\r\ncontent-length: ${big.length}\r\nconnection: keep-alive\r\n\r\n${big}`,
    );
    const first = await readUntil(socket, complete);
    expect(first.text).toMatch(/^HTTP\/1\.1 413/);
    const closes = /\r\nconnection: close\r\n/i.test(first.text);
    if (closes) {
      // It said close: the socket must then really end, not hang.
      const rest = first.ended ? first : await readUntil(socket, () => false);
      expect(rest.ended).toBe(true);
    } else {
      socket.write('GET /api/health HTTP/1.1\r\nhost: x\r\n\r\n');
      const second = await readUntil(socket, complete);
      expect(second.text).toMatch(/^HTTP\/1\.1 200/);
    }
    socket.destroy();
  });

  it('lets a fresh connection through at once', async () => {
    const r = await fetch(`http://127.0.0.1:${port}/api/health`);
    expect(r.status).toBe(200);
  });
});
