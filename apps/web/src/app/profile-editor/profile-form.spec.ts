import type { ProfileDocument } from '@clearbase/contracts';
import { curvePointProblems } from './curve-point-problems';
import { controlAtPath, createPointGroup, createProfileForm, readProfileForm } from './profile-form';

const document: ProfileDocument = {
  schemaVersion: 1,
  id: 'demo-glasswing-400',
  version: 2,
  stock: { name: 'Glasswing 400', process: 'C-41', base: 'tinted', iso: 400 },
  curves: {
    red: {
      points: [
        { logExposure: -3, density: 0 },
        { logExposure: -2, density: 0.493 },
        { logExposure: 0, density: 1.74 },
      ],
    },
    green: {
      points: [
        { logExposure: -3, density: 0 },
        { logExposure: 0, density: 1.83 },
      ],
    },
    blue: {
      points: [
        { logExposure: -3, density: 0 },
        { logExposure: -1.5, density: 0.9 },
        { logExposure: 0, density: 1.98 },
      ],
    },
  },
  crosstalk: [
    [1.12, -0.06, -0.06],
    [-0.06, 1.12, -0.06],
    [-0.06, -0.06, 1.12],
  ],
  balance: { cyanRed: 2, magentaGreen: -2, yellowBlue: -3 },
  tone: { contrast: 1.1, blackPoint: 0.01, whitePoint: 1 },
  saturation: 1.05,
};

describe('curve point validation', () => {
  it('accepts points whose log H and D both increase strictly', () => {
    expect(curvePointProblems(document.curves.red.points)).toEqual([]);
  });

  it('names the row and the column where log H or D stops increasing', () => {
    const problems = curvePointProblems([
      { logExposure: -3, density: 0 },
      { logExposure: -3, density: 0.5 },
      { logExposure: -1, density: 0.5 },
    ]);
    expect(problems.map((p) => [p.index, p.field])).toEqual([
      [1, 'logExposure'],
      [2, 'density'],
    ]);
    expect(problems[0]!.message).toBe('Point 2: log H must be above point 1’s (-3).');
  });

  it('asks for blank cells and for a second point', () => {
    expect(curvePointProblems([{ logExposure: null, density: 0 }]).map((p) => p.field)).toEqual([
      'points',
      'logExposure',
    ]);
  });

  it('marks the form invalid while a curve does not increase, and valid again once fixed', () => {
    const form = createProfileForm(document);
    const points = form.controls.curves.controls.green.controls.points;
    points.insert(1, createPointGroup({ logExposure: 1, density: 0.5 }));
    expect(form.valid).toBe(false);
    expect(points.errors?.['curvePoints']).toHaveLength(1);
    points.at(1).setValue({ logExposure: -1, density: 0.5 });
    expect(form.valid).toBe(true);
  });
});

describe('the profile form', () => {
  it('gives back the document it was filled from', () => {
    const form = createProfileForm(document);
    expect(readProfileForm(form.getRawValue(), document)).toEqual(document);
  });

  it('keeps a film’s wide capture primaries through an edit', () => {
    const wide: ProfileDocument = { ...document, capturePrimaries: 'wide' };
    const form = createProfileForm(wide);
    form.controls.balance.controls.magentaGreen.setValue(4);
    expect(readProfileForm(form.getRawValue(), wide).capturePrimaries).toBe('wide');
  });

  it('keeps a calibrated profile’s exposure matrix through an edit', () => {
    const exposureMatrix: ProfileDocument['exposureMatrix'] = [
      [1.2, -0.15, -0.05],
      [-0.1, 1.15, -0.05],
      [0.02, -0.12, 1.1],
    ];
    const calibrated: ProfileDocument = { ...document, exposureMatrix };
    const form = createProfileForm(calibrated);
    form.controls.balance.controls.magentaGreen.setValue(4);
    expect(readProfileForm(form.getRawValue(), calibrated).exposureMatrix).toEqual(exposureMatrix);
  });

  it('carries an edit into the document and keeps the labels it does not edit', () => {
    const form = createProfileForm(document);
    form.controls.balance.controls.magentaGreen.setValue(4);
    form.controls.crosstalk.at(2).at(1).setValue(-0.1);
    form.controls.curves.controls.blue.controls.points.removeAt(1);
    const edited = readProfileForm(form.getRawValue(), document);
    expect(edited.balance).toEqual({ cyanRed: 2, magentaGreen: 4, yellowBlue: -3 });
    expect(edited.crosstalk[2]).toEqual([-0.06, -0.1, 1.12]);
    expect(edited.curves.blue.points).toHaveLength(2);
    expect(edited).toMatchObject({ id: document.id, version: 2, stock: document.stock });
  });

  it('refuses tone values outside the profile schema’s bounds', () => {
    const form = createProfileForm(document);
    form.controls.tone.controls.contrast.setValue(0);
    expect(form.controls.tone.controls.contrast.errors).toMatchObject({ above: 'Must be above 0.' });
    form.controls.tone.controls.contrast.setValue(1);
    form.controls.tone.controls.whitePoint.setValue(0.005);
    expect(form.controls.tone.errors).toMatchObject({ whiteAboveBlack: expect.any(String) });
  });

  it('finds the field a server error’s path names, in either path style', () => {
    const form = createProfileForm(document);
    expect(controlAtPath(form, 'body.parameters.curves.red.points.2.density')).toBe(
      form.controls.curves.controls.red.controls.points.at(2).controls.density,
    );
    expect(controlAtPath(form, 'curves.red.points[1].logExposure')).toBe(
      form.controls.curves.controls.red.controls.points.at(1).controls.logExposure,
    );
    expect(controlAtPath(form, 'body.parameters.crosstalk.0.2')).toBe(form.controls.crosstalk.at(0).at(2));
    expect(controlAtPath(form, 'body.parameters.stock.name')).toBeNull();
  });
});
