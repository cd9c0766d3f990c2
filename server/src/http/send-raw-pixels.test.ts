import express from 'express';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { littleEndianBytes, sendRawPixels } from './send-raw-pixels';

describe('raw pixel replies', () => {
  it('puts 16-bit samples on the wire little-endian', () => {
    expect([...littleEndianBytes(Uint16Array.of(0x0102, 0xfffe))]).toEqual([0x02, 0x01, 0xfe, 0xff]);
  });

  it('answer octet-stream with the caching and description asked for', async () => {
    const app = express();
    app.get('/pixels', (_req, res) =>
      sendRawPixels(res, {
        pixels: Uint16Array.of(1, 2, 3),
        cacheControl: 'private, max-age=60',
        headers: { 'X-Negative-Width': '1', 'X-Negative-Height': '1' },
      }),
    );
    const res = await request(app)
      .get('/pixels')
      .buffer(true)
      .parse((r, done) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => done(null, Buffer.concat(chunks)));
      })
      .expect(200);
    expect(res.headers['content-type']).toBe('application/octet-stream');
    expect(res.headers['cache-control']).toBe('private, max-age=60');
    expect(res.headers['x-negative-width']).toBe('1');
    expect([...(res.body as Buffer)]).toEqual([1, 0, 2, 0, 3, 0]);
  });
});
