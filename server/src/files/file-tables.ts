import type { ColumnType, Generated, Selectable } from 'kysely';

/** A stored file, content-addressed by SHA-256 (DATA_DIR/files/ab/cdef…). */
export interface FilesTable {
  id: Generated<number>;
  sha256: string;
  size: number;
  media_type: string;
  created_at: ColumnType<string, string, never>;
}

export type FileRow = Selectable<FilesTable>;
