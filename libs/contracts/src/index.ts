export * from './auth/role';
export * from './auth/user';
export * from './auth/audit-entry';
export * from './problem/problem';
export * from './lab/lab';
export * from './profile/profile-document';
export * from './stocks/stock';
export * from './profiles/profile';
