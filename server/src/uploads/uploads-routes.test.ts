import { readdirSync } from 'node:fs';
import { join } from 'node:path';
import { crc32, deflateSync } from 'node:zlib';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { negativeTiff } from '../orders/order-test-fixtures';
import { createTestApp, type Client, type TestApp } from '../test-support/test-app';
import { addTestLab, type TestLab } from '../test-support/test-lab';

let t: TestApp;
let operator: Client;
let good: Buffer;
let good2: Buffer;
let lab: TestLab;

const newRoll = async () => (await lab.newRoll()).roll;

const upload = (roll: number) => operator.send('post', `/api/rolls/${roll}/frames`);
const tmpFiles = () => readdirSync(join(t.config.dataDir, 'tmp'));
const rows = async (table: 'files' | 'frames') =>
  Number(
    (
      await t.db
        .selectFrom(table)
        .select((eb) => eb.fn.countAll<number>().as('n'))
        .executeTakeFirstOrThrow()
    ).n,
  );

/** A PNG whose header claims width × height (PNG spec 11.2.2: 16-bit RGB), with a token of pixel data. */
function pngClaiming(width: number, height: number): Buffer {
  const chunk = (type: string, data: Buffer) => {
    const body = Buffer.concat([Buffer.from(type, 'ascii'), data]);
    const out = Buffer.alloc(12 + data.length);
    out.writeUInt32BE(data.length, 0);
    body.copy(out, 4);
    out.writeUInt32BE(crc32(body), 8 + data.length);
    return out;
  };
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(width, 0);
  ihdr.writeUInt32BE(height, 4);
  ihdr[8] = 16;
  ihdr[9] = 2;
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk('IHDR', ihdr),
    chunk('IDAT', deflateSync(Buffer.alloc(100))),
    chunk('IEND', Buffer.alloc(0)),
  ]);
}

beforeAll(async () => {
  t = await createTestApp({ UPLOAD_MAX_FILES: '4', UPLOAD_MAX_FILE_BYTES: '200000' });
  lab = await addTestLab(t);
  operator = lab.operator;
  good = await negativeTiff({ seed: 1 });
  good2 = await negativeTiff({ seed: 2 });
});
afterAll(() => t.close());

describe('uploading negative scans', () => {
  it('keeps good scans as numbered frames, queued, with their base measured', async () => {
    const roll = await newRoll();
    const res = await upload(roll)
      .attach('files', good, 'frame-01.tif')
      .attach('files', good2, 'frame-02.tif');
    expect(res.status).toBe(201);
    expect(res.body.rejected).toEqual([]);
    expect(res.body.accepted.map((a: { index: number }) => a.index)).toEqual([1, 2]);
    const detail = await operator.get(`/api/rolls/${roll}`).expect(200);
    expect(detail.body.roll.status).toBe('scanned');
    expect(detail.body.roll.base).toMatchObject({ mode: 'auto', measured: { region: null } });
    expect(detail.body.roll.base.measured.confidence).toBeGreaterThan(0);
    expect(detail.body.frames).toHaveLength(2);
    expect(detail.body.frames[0]).toMatchObject({
      fileName: 'frame-01.tif',
      width: 96,
      height: 64,
      bitDepth: 16,
      status: 'queued',
      outputs: [],
    });
    expect(detail.body.frames[0].base.measured.confidence).toBeGreaterThan(0);
    expect(tmpFiles()).toEqual([]);
  });

  it('rejects each bad file with its own reason, keeps the good ones of the same request, and leaves nothing of the bad', async () => {
    const roll = await newRoll();
    const tiff = await negativeTiff({ seed: 3 });
    const jpeg = await sharp(Buffer.alloc(32 * 32 * 3, 128), { raw: { width: 32, height: 32, channels: 3 } })
      .jpeg()
      .toBuffer();
    const filesBefore = await rows('files');
    const framesBefore = await rows('frames');
    const res = await upload(roll)
      .attach('files', Buffer.from('not a scan at all'), 'notes.tif')
      .attach('files', Buffer.alloc(0), 'empty.tif')
      .attach('files', tiff.subarray(0, Math.floor(tiff.length / 2)), 'cut-off.tif')
      .attach('files', tiff, 'whole.tif');
    expect(res.status).toBe(201);
    expect(res.body.accepted.map((a: { fileName: string }) => a.fileName)).toEqual(['whole.tif']);
    expect(res.body.rejected).toEqual([
      {
        fileName: 'notes.tif',
        code: 'not-an-image',
        reason: 'The file is not an image: it does not start like a TIFF, PNG or JPEG file.',
      },
      { fileName: 'empty.tif', code: 'empty', reason: 'The file is empty (0 bytes).' },
      {
        fileName: 'cut-off.tif',
        code: 'truncated',
        reason: expect.stringContaining('incomplete or damaged'),
      },
    ]);
    expect(await rows('files')).toBe(filesBefore + 1);
    expect(await rows('frames')).toBe(framesBefore + 1);
    expect(tmpFiles()).toEqual([]);

    const only = await upload(roll)
      .attach('files', pngClaiming(100_000, 100_000), 'huge.png')
      .attach('files', jpeg, 'eight-bit.jpg');
    expect(only.status).toBe(422);
    expect(only.headers['content-type']).toContain('application/problem+json');
    expect(only.body.code).toBe('no-usable-scans');
    expect(only.body.errors).toEqual([
      {
        path: 'files.huge.png',
        message: expect.stringMatching(/^huge\.png: The image is 100000 × 100000 pixels/),
      },
      { path: 'files.eight-bit.jpg', message: expect.stringMatching(/^eight-bit\.jpg: The file is a JPEG/) },
    ]);
    expect(await rows('files')).toBe(filesBefore + 1);
    expect(tmpFiles()).toEqual([]);
  });

  it('refuses a file over the size limit on its own', async () => {
    const roll = await newRoll();
    const res = await upload(roll)
      .attach('files', Buffer.alloc(300_000, 7), 'too-big.tif')
      .attach('files', await negativeTiff({ seed: 4 }), 'fine.tif');
    expect(res.status).toBe(201);
    expect(res.body.rejected).toEqual([
      {
        fileName: 'too-big.tif',
        code: 'file-too-large',
        reason: 'The file is larger than the limit of 200000 bytes per scan.',
      },
    ]);
    expect(tmpFiles()).toEqual([]);
  });

  it('refuses more files than allowed per upload with a 413 problem and keeps none of them', async () => {
    const roll = await newRoll();
    const before = await rows('frames');
    let req = upload(roll);
    for (let i = 1; i <= 5; i++)
      req = req.attach('files', await negativeTiff({ seed: 10 + i }), `f-${i}.tif`);
    const res = await req;
    expect(res.status).toBe(413);
    expect(res.body.detail).toBe(
      'At most 4 files per upload; nothing was kept. Send the rest in another upload.',
    );
    expect(await rows('frames')).toBe(before);
    expect(tmpFiles()).toEqual([]);
  });

  it('stores the same bytes once, shared by rolls, and refuses the same scan twice on one roll', async () => {
    const a = await newRoll();
    const b = await newRoll();
    const scan = await negativeTiff({ seed: 42 });
    const filesBefore = await rows('files');
    const first = await upload(a).attach('files', scan, 'x.tif').expect(201);
    const second = await upload(b).attach('files', scan, 'x-again.tif').expect(201);
    expect(first.body.accepted[0].duplicate).toBe(false);
    expect(second.body.accepted[0].duplicate).toBe(true);
    expect(await rows('files')).toBe(filesBefore + 1);
    const again = await upload(a).attach('files', scan, 'x.tif');
    expect(again.status).toBe(422);
    expect(again.body.errors[0].message).toBe('x.tif: The same scan is already frame 1 of this roll.');
    const stored = readdirSync(join(t.config.dataDir, 'files'), { recursive: true });
    expect(stored.filter((f) => String(f).length > 3)).toHaveLength(await rows('files'));
  });

  it('refuses a greyscale scan and keeps an 8-bit one with a warning', async () => {
    const roll = await newRoll();
    const grey = await sharp(new Uint16Array(64 * 48).fill(30000), {
      raw: { width: 64, height: 48, channels: 1 },
    })
      .toColourspace('grey16')
      .png()
      .toBuffer();
    const eight = await sharp(await negativeTiff({ seed: 77 }))
      .toColourspace('srgb')
      .png()
      .toBuffer();
    const res = await upload(roll).attach('files', grey, 'grey.png').attach('files', eight, 'eight.png');
    expect(res.status).toBe(201);
    expect(res.body.rejected).toEqual([
      { fileName: 'grey.png', code: 'not-colour', reason: expect.stringContaining('greyscale') },
    ]);
    expect(res.body.accepted[0].warnings).toEqual([expect.stringContaining('8 bits per channel')]);
    expect(tmpFiles()).toEqual([]);
  });

  it('asks for files when the request has none', async () => {
    const roll = await newRoll();
    const res = await operator.post(`/api/rolls/${roll}/frames`, {});
    expect(res.status).toBe(400);
    expect(res.body.code).toBe('no-files');
  });
});
