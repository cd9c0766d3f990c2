/** True when SQLite refused a row for breaking a UNIQUE constraint (better-sqlite3's error code). */
export function isUniqueViolation(err: unknown): boolean {
  return (
    typeof err === 'object' && err !== null && (err as { code?: string }).code === 'SQLITE_CONSTRAINT_UNIQUE'
  );
}
