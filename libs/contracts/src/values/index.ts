/**
 * Plain values of the API — roles, limits, header names — without zod, so the web app imports them instead of
 * copying them (`@clearbase/contracts/values`). The schemas in `@clearbase/contracts` are built from the same values.
 */
export * from './roles';
export * from './text-limits';
export * from './film-speed';
export * from './http-headers';
export * from './order-enums';
