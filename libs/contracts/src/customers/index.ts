export * from './caught-mail';
export * from './signup';
export * from './price-list';
export * from './payment';
export * from './outbox-entry';
