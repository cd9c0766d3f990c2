import { centralHalf, chartOverlay, clientToFrame, rectangleBetween } from './chart-overlay';

describe('chart overlay maths', () => {
  it('maps a click on the scaled preview to full-size frame pixels', () => {
    const box = { left: 100, top: 50, width: 200, height: 100 };
    expect(clientToFrame({ x: 150, y: 60 }, box, { width: 4000, height: 2000 })).toEqual([1000, 200]);
    expect(clientToFrame({ x: 90, y: 500 }, box, { width: 4000, height: 2000 })).toEqual([0, 2000]);
  });

  it('draws 24 cells with their sampling areas once four corners are set', () => {
    expect(chartOverlay([[0, 0]])).toEqual([]);
    const grid = chartOverlay([
      [0, 0],
      [600, 0],
      [600, 400],
      [0, 400],
    ]);
    expect(grid).toHaveLength(24);
    // patch 1 is the first cell: 100 × 100 pixels, its sampling area the central half each way
    expect(grid[0]).toEqual({
      index: 1,
      cell: '0.0,0.0 100.0,0.0 100.0,100.0 0.0,100.0',
      sample: '25.0,25.0 75.0,25.0 75.0,75.0 25.0,75.0',
    });
    expect(grid[23]!.cell).toBe('500.0,300.0 600.0,300.0 600.0,400.0 500.0,400.0');
  });

  it('follows a chart shot at an angle with perspective: far cells come out smaller', () => {
    const grid = chartOverlay([
      [0, 0],
      [600, 100],
      [600, 300],
      [0, 400],
    ]);
    const width = (cell: string) => {
      const xs = cell.split(' ').map((p) => Number(p.split(',')[0]));
      return Math.max(...xs) - Math.min(...xs);
    };
    expect(width(grid[5]!.cell)).toBeLessThan(width(grid[0]!.cell));
  });

  it('gives no grid for corners that make no quadrilateral', () => {
    expect(
      chartOverlay([
        [0, 0],
        [0, 0],
        [0, 0],
        [0, 0],
      ]),
    ).toEqual([]);
  });

  it('turns a drag either way into a rectangle inside the frame', () => {
    expect(rectangleBetween([30, 40], [10, 10], { width: 100, height: 100 })).toEqual({
      x: 10,
      y: 10,
      width: 20,
      height: 30,
    });
    expect(rectangleBetween([95, 95], [95, 95], { width: 100, height: 100 })).toEqual({
      x: 95,
      y: 95,
      width: 1,
      height: 1,
    });
    expect(centralHalf({ width: 32, height: 44 })).toEqual({ x: 8, y: 11, width: 16, height: 22 });
  });
});
