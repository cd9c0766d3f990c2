export * from './caught-mail';
export * from './signup';
