// Building a stock profile from a calibration roll: grey bracket, colour chart, film base.
export * from './chart-reference';
export * from './homography';
export * from './chart-grid';
export * from './sample-region';
export * from './isotonic-regression';
export * from './characteristic-curve-fit';
export * from './speed-point';
export * from './bracket-balance';
export * from './crosstalk-fit';
export * from './levenberg-marquardt';
export * from './colour-matrix-fit';
export * from './chart-colour-fit';
export * from './chart-delta-e';
export * from './calibration-warning';
export * from './build-calibration';
export * from './calibration-roll';
