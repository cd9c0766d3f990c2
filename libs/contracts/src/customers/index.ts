export * from './caught-mail';
