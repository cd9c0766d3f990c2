import { describe, expect, it } from 'vitest';
import { validateProfileDocument, validateScannerProfile } from './profile-document';

const curve = (gamma: number) => ({
  points: [-2, -1, 0, 1].map((x) => ({ logExposure: x, density: gamma * (x + 2.5) })),
});
const valid = {
  schemaVersion: 1,
  id: 'demo-stock',
  version: 3,
  stock: { name: 'Demo stock 200', process: 'C-41', base: 'tinted', iso: 200 },
  curves: { red: curve(0.6), green: curve(0.62), blue: curve(0.66) },
  crosstalk: [
    [1.05, -0.04, -0.01],
    [-0.03, 1.06, -0.03],
    [0, -0.1, 1.1],
  ],
  balance: { cyanRed: 0, magentaGreen: -2, yellowBlue: 1 },
  tone: { contrast: 1.1, blackPoint: 0.002, whitePoint: 1.05 },
  saturation: 1,
};

describe('profile document validation', () => {
  it('accepts a complete version-1 document', () => {
    const result = validateProfileDocument(valid);
    expect(result.ok).toBe(true);
  });
  it('names the exact control point whose density does not increase', () => {
    const doc = structuredClone(valid);
    doc.curves.red.points[2]!.density = 0.1;
    const result = validateProfileDocument(doc);
    expect(result.ok).toBe(false);
    if (!result.ok)
      expect(result.errors).toContainEqual({
        path: 'curves.red.points[2].density',
        message: 'density must increase from point to point',
      });
  });
  it('rejects unknown schema versions, unknown fields and a white point below the black point', () => {
    const result = validateProfileDocument({
      ...valid,
      schemaVersion: 2,
      extra: true,
      tone: { contrast: 1, blackPoint: 0.2, whitePoint: 0.1 },
    });
    expect(result.ok).toBe(false);
    if (!result.ok) {
      const paths = result.errors.map((e) => e.path);
      expect(paths).toContain('schemaVersion');
      expect(paths).toContain('tone.whitePoint');
      expect(paths).toContain('');
    }
  });
  it('rejects a crosstalk matrix that is not 3×3', () => {
    const result = validateProfileDocument({
      ...valid,
      crosstalk: [
        [1, 0],
        [0, 1, 0],
        [0, 0, 1],
      ],
    });
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.errors[0]!.path).toMatch(/^crosstalk\[0\]/);
  });
  it('validates scanner profiles with per-channel black levels and gains', () => {
    expect(
      validateScannerProfile({
        name: 'Bench A',
        encoding: 'gamma',
        gamma: 2.2,
        blackLevel: [0.001, 0.001, 0.002],
        gains: [1, 1.02, 1.1],
      }).ok,
    ).toBe(true);
    const bad = validateScannerProfile({
      name: 'Bench A',
      encoding: 'log',
      gamma: 2.2,
      blackLevel: [0.9, 0, 0],
      gains: [1, 1, 0],
    });
    expect(bad.ok).toBe(false);
    if (!bad.ok)
      expect(bad.errors.map((e) => e.path).sort()).toEqual(['blackLevel[0]', 'encoding', 'gains[2]']);
  });
});
