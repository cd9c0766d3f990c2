export * from './order';
export * from './roll';
export * from './frame';
export * from './job';
export * from './order-detail';
