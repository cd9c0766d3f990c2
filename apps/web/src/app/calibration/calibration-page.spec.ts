import { stopsFromFileName } from './calibration-page';

describe('stops from a grey frame’s file name', () => {
  it('reads a signed number before the extension', () => {
    expect(stopsFromFileName('grey+1.5.tif')).toBe(1.5);
    expect(stopsFromFileName('grey_-2.tif')).toBe(-2);
    expect(stopsFromFileName('bracket +0.33 stops.png')).toBe(0.33);
  });

  it('leaves the stops empty when the name carries none', () => {
    expect(stopsFromFileName('grey-03.tif')).toBeNull();
    expect(stopsFromFileName('grey03.tif')).toBeNull();
  });
});
