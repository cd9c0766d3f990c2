/** The shared password of every demo account, as `server/src/demo/seed.ts` seeds them. */
export const demoPassword = 'clearbase-demo';
