/**
 * True when SQLite refused a row for breaking a UNIQUE constraint (better-sqlite3's error code), so a caller can
 * answer 409 with the field that clashed instead of 500.
 * @example try { await insertStock(db, body, at); } catch (err) { if (isUniqueViolation(err)) throw new AppError('stock-exists', 409, '…'); throw err; }
 */
export function isUniqueViolation(err: unknown): boolean {
  return (
    typeof err === 'object' && err !== null && (err as { code?: string }).code === 'SQLITE_CONSTRAINT_UNIQUE'
  );
}
