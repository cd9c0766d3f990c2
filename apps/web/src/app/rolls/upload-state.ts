import type { UploadResult } from '@clearbase/contracts';

/** Where one picked file stands: waiting its turn, travelling, kept as a frame, or refused with a reason. */
export type UploadFileState = 'queued' | 'sending' | 'accepted' | 'rejected';

/** One picked file as the upload list shows it. */
export interface UploadItem {
  /** Unique within the page; files may share a name. */
  key: number;
  fileName: string;
  /** Bytes of the file. */
  size: number;
  /** Bytes of it the browser has sent. */
  sentBytes: number;
  state: UploadFileState;
  /** Why the server refused it, in its words. */
  reason: string | null;
  /** The frame made from it, once accepted. */
  frameId: number | null;
  frameIndex: number | null;
  warnings: string[];
}

/** Every file picked on this page so far, newest batch last. */
export interface UploadState {
  items: UploadItem[];
}

/** What happened to the files of one request, as the page sees it. */
export type UploadAction =
  | { type: 'picked'; files: { key: number; fileName: string; size: number }[] }
  | { type: 'started'; keys: number[] }
  /** Upload progress of one request: bytes of the whole request body (multipart framing included). */
  | { type: 'progress'; keys: number[]; loaded: number; total: number | null }
  | { type: 'answered'; keys: number[]; result: UploadResult }
  /**
   * The request failed as a whole. `fileReasons` holds the server's per-file reasons (problem `errors` with paths
   * `files.<name>`), `message` the sentence for any file it names no reason for.
   */
  | { type: 'failed'; keys: number[]; message: string; fileReasons: Readonly<Record<string, string>> };

export const emptyUploads: UploadState = { items: [] };

/** The batch as one bar: bytes sent over bytes picked, finished files counting whole. */
export interface UploadBatch {
  files: number;
  finished: number;
  accepted: number;
  rejected: number;
  sentBytes: number;
  totalBytes: number;
  /** 0 to 100. */
  percent: number;
  busy: boolean;
}

const finished = (s: UploadFileState) => s === 'accepted' || s === 'rejected';

function patch(
  state: UploadState,
  keys: readonly number[],
  change: (item: UploadItem) => UploadItem,
): UploadState {
  const wanted = new Set(keys);
  return { items: state.items.map((item) => (wanted.has(item.key) ? change(item) : item)) };
}

/** The reason a problem's `files.<name>` errors give for a file, without the file name the message starts with. */
function reasonFor(fileName: string, fileReasons: Readonly<Record<string, string>>): string | null {
  const said = fileReasons[`files.${fileName}`];
  if (said === undefined) return null;
  const prefix = `${fileName}: `;
  return said.startsWith(prefix) ? said.slice(prefix.length) : said;
}

/**
 * Folds one upload event into the list. Progress of a request carrying several files is spread over them in order
 * (the browser sends the parts one after another), so each bar only claims bytes that really left. Answers are
 * matched to files by name, in order, so two files of the same name each get their own verdict.
 *
 * @example
 * reduceUploads(emptyUploads, { type: 'picked', files: [{ key: 1, fileName: 'a.tif', size: 10 }] }).items[0].state
 * // 'queued'
 */
export function reduceUploads(state: UploadState, action: UploadAction): UploadState {
  switch (action.type) {
    case 'picked':
      return {
        items: [
          ...state.items,
          ...action.files.map((f): UploadItem => ({
            ...f,
            sentBytes: 0,
            state: 'queued',
            reason: null,
            frameId: null,
            frameIndex: null,
            warnings: [],
          })),
        ],
      };
    case 'started':
      return patch(state, action.keys, (item) =>
        finished(item.state) ? item : { ...item, state: 'sending' },
      );
    case 'progress': {
      const members = state.items.filter((i) => action.keys.includes(i.key));
      const fileBytes = members.reduce((sum, i) => sum + i.size, 0);
      const total = action.total ?? fileBytes;
      // the body is the files plus a little multipart framing: scale to the files' own bytes
      let left = total > 0 ? Math.round((Math.min(action.loaded, total) / total) * fileBytes) : 0;
      const sent = new Map<number, number>();
      for (const m of members) {
        const take = Math.min(m.size, left);
        sent.set(m.key, take);
        left -= take;
      }
      return patch(state, action.keys, (item) =>
        finished(item.state)
          ? item
          : { ...item, state: 'sending', sentBytes: Math.max(item.sentBytes, sent.get(item.key) ?? 0) },
      );
    }
    case 'answered': {
      const accepted = [...action.result.accepted];
      const rejected = [...action.result.rejected];
      return patch(state, action.keys, (item) => {
        const a = accepted.findIndex((r) => r.fileName === item.fileName);
        if (a >= 0) {
          const [r] = accepted.splice(a, 1);
          return {
            ...item,
            state: 'accepted',
            sentBytes: item.size,
            frameId: r!.frameId,
            frameIndex: r!.index,
            warnings: r!.warnings,
          };
        }
        const j = rejected.findIndex((r) => r.fileName === item.fileName);
        if (j >= 0) {
          const [r] = rejected.splice(j, 1);
          return { ...item, state: 'rejected', sentBytes: item.size, reason: r!.reason };
        }
        return {
          ...item,
          state: 'rejected',
          sentBytes: item.size,
          reason: 'The server did not say what became of it.',
        };
      });
    }
    case 'failed':
      return patch(state, action.keys, (item) => ({
        ...item,
        state: 'rejected',
        sentBytes: item.size,
        reason: reasonFor(item.fileName, action.fileReasons) ?? action.message,
      }));
  }
}

/** The batch bar and counts of the files picked so far. */
export function uploadBatch(state: UploadState): UploadBatch {
  const items = state.items;
  const totalBytes = items.reduce((sum, i) => sum + i.size, 0);
  const sentBytes = items.reduce((sum, i) => sum + (finished(i.state) ? i.size : i.sentBytes), 0);
  const done = items.filter((i) => finished(i.state)).length;
  return {
    files: items.length,
    finished: done,
    accepted: items.filter((i) => i.state === 'accepted').length,
    rejected: items.filter((i) => i.state === 'rejected').length,
    sentBytes,
    totalBytes,
    percent: totalBytes > 0 ? Math.round((sentBytes / totalBytes) * 100) : items.length ? 100 : 0,
    busy: done < items.length,
  };
}

/** How far one file is, 0 to 100. */
export function itemPercent(item: UploadItem): number {
  if (finished(item.state)) return 100;
  return item.size > 0 ? Math.round((item.sentBytes / item.size) * 100) : 0;
}
