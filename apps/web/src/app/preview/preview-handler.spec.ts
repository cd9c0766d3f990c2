import {
  applyInversion,
  compileInversion,
  exposeNegative,
  LINEAR_SCANNER,
  outdoorScene,
  POLYCLEAR_200,
  profileForStock,
  type InversionProfile,
} from '@clearbase/inversion';
import type { LoadNegativeMessage, RenderedReply } from './preview-messages';
import { createPreviewHandler } from './preview-handler';
import { createPreviewPlanBuilder } from './preview-plan-builder';

const profile: InversionProfile = profileForStock(POLYCLEAR_200);

/** A uniform 18 % grey card, 24 × 16 pixels, exposed and scanned through the invented clear-base film. */
function greyCard() {
  const width = 24,
    height = 16;
  const rgb = new Float32Array(width * height * 3).fill(0.18);
  return exposeNegative({ width, height, rgb }, { stock: POLYCLEAR_200, scanner: LINEAR_SCANNER });
}

function loadMessage(negative: ReturnType<typeof greyCard>): LoadNegativeMessage {
  return {
    kind: 'load',
    width: negative.width,
    height: negative.height,
    pixels: negative.data,
    base: negative.truth.base,
    scanner: LINEAR_SCANNER,
    levelsProfile: profile,
  };
}

function pixelAt(reply: RenderedReply, x: number, y: number): number[] {
  const o = (y * reply.width + x) * 4;
  return Array.from(reply.rgba.subarray(o, o + 4));
}

describe('the preview worker’s handler', () => {
  it('renders a grey card grey, at mid-grey, with opaque RGBA pixels', () => {
    const handle = createPreviewHandler();
    const loaded = handle(loadMessage(greyCard())).reply;
    expect(loaded.kind).toBe('loaded');
    const { reply, transfer } = handle({ kind: 'render', id: 1, side: 'after', profile });
    expect(reply.kind).toBe('rendered');
    const rendered = reply as RenderedReply;
    expect(transfer).toEqual([rendered.rgba.buffer]);
    expect(rendered.rgba.length).toBe(24 * 16 * 4);
    const [r, g, b, a] = pixelAt(rendered, 12, 8);
    expect(a).toBe(255);
    expect(Math.max(r!, g!, b!) - Math.min(r!, g!, b!)).toBeLessThanOrEqual(1);
    // auto exposure puts the card at 18 % grey; the print tone keeps it near the middle of the code range
    expect(g).toBeGreaterThan(90);
    expect(g).toBeLessThan(160);
  });

  it('makes a grey card greener when the balance moves toward green, and magenta when it moves back', () => {
    const handle = createPreviewHandler();
    handle(loadMessage(greyCard()));
    const render = (magentaGreen: number, id: number) =>
      handle({
        kind: 'render',
        id,
        side: 'after',
        profile: { ...profile, balance: { ...profile.balance, magentaGreen } },
      }).reply as RenderedReply;
    const [r1, g1] = pixelAt(render(8, 1), 12, 8);
    const [r2, g2] = pixelAt(render(-8, 2), 12, 8);
    expect(g1! - r1!).toBeGreaterThan(5);
    expect(r2! - g2!).toBeGreaterThan(5);
  });

  it('answers a render before any negative with a failure that names the request', () => {
    const handle = createPreviewHandler();
    const { reply } = handle({ kind: 'render', id: 7, side: 'before', profile });
    expect(reply).toMatchObject({ kind: 'failed', id: 7 });
  });

  it('reports how long the tables and the pixels took, from its clock', () => {
    let now = 0;
    const handle = createPreviewHandler(() => (now += 5));
    handle(loadMessage(greyCard()));
    const reply = handle({ kind: 'render', id: 1, side: 'after', profile }).reply as RenderedReply;
    expect(reply.compileMs).toBe(5);
    expect(reply.renderMs).toBe(5);
  });
});

describe('preview plans', () => {
  it('render the same as the engine’s compiled plan within one code, after balance, tone and crosstalk changes', () => {
    const negative = exposeNegative(outdoorScene(60, 40), { stock: POLYCLEAR_200, scanner: LINEAR_SCANNER });
    const base = negative.truth.base;
    const planFor = createPreviewPlanBuilder(LINEAR_SCANNER, base, -0.7);
    planFor(profile);
    const edited: InversionProfile = {
      ...profile,
      balance: { cyanRed: 3, magentaGreen: -4, yellowBlue: 2 },
      tone: { contrast: 1.3, blackPoint: 0.01, whitePoint: 1.2 },
      saturation: 1.2,
    };
    const ours = new Uint8Array(negative.data.length);
    const engines = new Uint8Array(negative.data.length);
    const pixels = negative.width * negative.height;
    applyInversion(planFor(edited), negative.data, ours, 0, pixels);
    const reference = compileInversion({
      profile: edited,
      scanner: LINEAR_SCANNER,
      base,
      midLogExposure: -0.7,
      render: 'print',
      outputBits: 8,
    });
    applyInversion(reference, negative.data, engines, 0, pixels);
    let worst = 0;
    for (let i = 0; i < ours.length; i++) worst = Math.max(worst, Math.abs(ours[i]! - engines[i]!));
    expect(worst).toBeLessThanOrEqual(1);
  });
});
