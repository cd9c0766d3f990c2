import { mkdir, rename, unlink } from 'node:fs/promises';
import { join } from 'node:path';
import sharp from 'sharp';
import {
  CHART_REFERENCE,
  chartScene,
  DEMO_STOCKS,
  exposeNegative,
  gradientScene,
  greySteps,
  LINEAR_SCANNER,
  MID_GREY,
  outdoorScene,
  type FilmStock,
  type Scene,
} from '@clearbase/inversion';
import { parseCommandArgs } from './parse-command-args';
import { UsageError } from './usage-error';

/** The forward model's demo stocks by command-line name: the kebab-case of the stock's name. */
export const SYNTH_STOCKS: Readonly<Record<string, FilmStock>> = Object.fromEntries(
  DEMO_STOCKS.map((stock) => [stockKey(stock), stock]),
);

/** Kebab-case of a stock's name, e.g. 'clearbase-polyclear-200' (also the id of `profileForStock`). */
export function stockKey(stock: FilmStock): string {
  return stock.name.toLowerCase().replace(/[^a-z0-9]+/g, '-');
}

/** Rebate strips above and below the frame, as a fraction of the scan's height (invented, typical of 35 mm). */
const REBATE_FRACTION = 0.06;

/** What a demo negative shows. */
export const SYNTH_SCENES = ['outdoor', 'chart', 'grey-steps', 'gradient'] as const;
export type SynthScene = (typeof SYNTH_SCENES)[number];

// Grey steps: 11 steps from 3 % to 90 % reflectance, about a grey scale's range (common practice, from memory).
const GREY_STEPS = 11,
  DARKEST_GREY = 0.03,
  LIGHTEST_GREY = 0.9;
// Gradient: 1 % to 100 % reflectance, past both ends of a grey scale (invented).
const GRADIENT_DARKEST = 0.01,
  GRADIENT_LIGHTEST = 1;

/**
 * A scene of exactly `width` × `height` pixels: the outdoor scene, the 24-patch chart (published L*a*b*) or
 * the grey steps centred on an 18 % grey surround, or a neutral gradient.
 * @example sceneOfSize('chart', 600, 400).width // 600
 */
export function sceneOfSize(scene: SynthScene, width: number, height: number): Scene {
  switch (scene) {
    case 'outdoor':
      return outdoorScene(width, height);
    case 'gradient':
      return gradientScene(width, height, GRADIENT_DARKEST, GRADIENT_LIGHTEST);
    case 'chart': {
      const patch = Math.max(1, Math.floor(Math.min(width / 6, height / 4)));
      return centred(chartScene([...CHART_REFERENCE], patch).scene, width, height);
    }
    case 'grey-steps': {
      const step = Math.max(1, Math.floor(width / GREY_STEPS));
      return centred(greySteps(GREY_STEPS, DARKEST_GREY, LIGHTEST_GREY, step, height), width, height);
    }
  }
}

/** `inner` in the middle of a width × height scene of mid grey (cropped if larger). */
function centred(inner: Scene, width: number, height: number): Scene {
  const rgb = new Float32Array(width * height * 3).fill(MID_GREY);
  const dx = Math.floor((width - inner.width) / 2),
    dy = Math.floor((height - inner.height) / 2);
  for (let y = 0; y < inner.height; y++) {
    const ty = y + dy;
    if (ty < 0 || ty >= height) continue;
    for (let x = 0; x < inner.width; x++) {
      const tx = x + dx;
      if (tx < 0 || tx >= width) continue;
      rgb.set(
        inner.rgb.subarray((y * inner.width + x) * 3, (y * inner.width + x) * 3 + 3),
        (ty * width + tx) * 3,
      );
    }
  }
  return { width, height, rgb };
}

/**
 * One demo negative of `width` × `height` pixels: a scene (outdoor by default) between unexposed rebate
 * strips with sprocket holes, light grain and a little dust.
 */
export function demoNegative(options: {
  width: number;
  height: number;
  stock: FilmStock;
  scene?: SynthScene;
  exposureStops?: number;
  seed?: number;
}): ReturnType<typeof exposeNegative> {
  const rebate = Math.max(4, Math.round(REBATE_FRACTION * options.height));
  const scene = sceneOfSize(
    options.scene ?? 'outdoor',
    options.width,
    Math.max(1, options.height - 2 * rebate),
  );
  return exposeNegative(scene, {
    stock: options.stock,
    scanner: LINEAR_SCANNER,
    exposureStops: options.exposureStops ?? 0,
    grain: 0.004,
    seed: options.seed ?? 1,
    rebate,
    sprocketHoles: true,
    dust: 3,
  });
}

/**
 * `clearbase synth --out DIR [--frames N] [--stock NAME] [--scene outdoor|chart|grey-steps|gradient]`: demo
 * negatives from the forward model, 16-bit TIFF, named <stock>-frame-NN.tif (<stock>-<scene>-frame-NN.tif
 * for a scene other than outdoor).
 */
export async function synthCommand(args: string[]): Promise<number> {
  const { values, positionals } = parseCommandArgs(args, {
    out: { type: 'string' },
    frames: { type: 'string', default: '6' },
    stock: { type: 'string', default: 'clearbase-polyclear-200' },
    scene: { type: 'string', default: 'outdoor' },
    width: { type: 'string', default: '1200' },
    height: { type: 'string', default: '800' },
  });
  if (positionals.length) throw new UsageError(`Unexpected argument "${positionals[0]}".`);
  if (!values.out) throw new UsageError('Missing --out DIR.');
  const frames = integerOption('frames', values.frames, 1, 100);
  const width = integerOption('width', values.width, 16, 20000);
  const height = integerOption('height', values.height, 16, 20000);
  const stock = SYNTH_STOCKS[values.stock];
  if (!stock)
    throw new UsageError(`Unknown stock "${values.stock}"; known: ${Object.keys(SYNTH_STOCKS).join(', ')}.`);
  const scene = values.scene as SynthScene;
  if (!SYNTH_SCENES.includes(scene))
    throw new UsageError(
      `Expected one of ${SYNTH_SCENES.join(', ')} for --scene but received ${values.scene}.`,
    );
  await mkdir(values.out, { recursive: true });
  const prefix = scene === 'outdoor' ? values.stock : `${values.stock}-${scene}`;
  for (let n = 1; n <= frames; n++) {
    // Exposures spread over ±1 stop across the roll, as a real roll varies.
    const exposureStops = frames === 1 ? 0 : -1 + (2 * (n - 1)) / (frames - 1);
    const neg = demoNegative({ width, height, stock, scene, exposureStops, seed: n });
    const path = join(values.out, `${prefix}-frame-${String(n).padStart(2, '0')}.tif`);
    await writeNegativeTiff(path, neg.data, neg.width, neg.height);
    process.stdout.write(`${path}\n`);
  }
  return 0;
}

/** 16-bit deflate TIFF written under a temporary name and renamed into place. */
export async function writeNegativeTiff(
  path: string,
  data: Uint16Array,
  width: number,
  height: number,
): Promise<void> {
  const tmp = `${path}.${process.pid}.tmp`;
  try {
    await sharp(data, { raw: { width, height, channels: 3 } })
      .toColourspace('rgb16')
      .tiff({ compression: 'deflate', predictor: 'horizontal' })
      .toFile(tmp);
    await rename(tmp, path);
  } catch (error) {
    await unlink(tmp).catch(() => undefined);
    throw error;
  }
}

export function integerOption(name: string, raw: string | undefined, min: number, max: number): number {
  const value = Number(raw);
  if (!Number.isInteger(value) || value < min || value > max) {
    throw new UsageError(`Expected integer between ${min} and ${max} for --${name} but received ${raw}.`);
  }
  return value;
}
