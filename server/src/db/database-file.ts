/** The SQLite file's name inside DATA_DIR. */
export const databaseFileName = 'clearbase.sqlite';
