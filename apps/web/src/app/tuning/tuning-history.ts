import type { Adjustments } from '@clearbase/contracts';

/** What the tuning controls edit: a roll's or one frame's adjustments. */
export type TuningTarget = { kind: 'roll' } | { kind: 'frame'; frameId: number };

/** One state of the edits: the roll's adjustments and each frame's, by frame id. */
export interface TuningState {
  roll: Adjustments;
  frames: Record<number, Adjustments>;
}

/** Undo and redo over tuning states: the past (oldest first), the present and the undone future (next first). */
export interface TuningHistory {
  past: TuningState[];
  present: TuningState;
  future: TuningState[];
}

export type HistoryAction =
  | { type: 'set'; target: TuningTarget; adjustments: Adjustments }
  | { type: 'copy'; from: Adjustments; frameIds: readonly number[] }
  | { type: 'undo' }
  | { type: 'redo' }
  | { type: 'reset'; state: TuningState };

// 200 steps cover a long session on one roll without holding much: our choice
export const HISTORY_LIMIT = 200;

export function startHistory(state: TuningState): TuningHistory {
  return { past: [], present: state, future: [] };
}

function push(history: TuningHistory, next: TuningState): TuningHistory {
  const past = [...history.past, history.present];
  return { past: past.length > HISTORY_LIMIT ? past.slice(-HISTORY_LIMIT) : past, present: next, future: [] };
}

/**
 * The tuning history reducer. A change of the roll, a frame, or a copy to several frames is one step; `undo` and
 * `redo` move between steps; a new change drops what was undone; `reset` starts over from a saved state.
 * @example historyReducer(h, { type: 'set', target: { kind: 'frame', frameId: 3 }, adjustments })
 */
export function historyReducer(history: TuningHistory, action: HistoryAction): TuningHistory {
  switch (action.type) {
    case 'set': {
      const { present } = history;
      const next: TuningState =
        action.target.kind === 'roll'
          ? { ...present, roll: action.adjustments }
          : { ...present, frames: { ...present.frames, [action.target.frameId]: action.adjustments } };
      return JSON.stringify(next) === JSON.stringify(present) ? history : push(history, next);
    }
    case 'copy': {
      if (action.frameIds.length === 0) return history;
      const frames = { ...history.present.frames };
      for (const id of action.frameIds) frames[id] = action.from;
      return push(history, { ...history.present, frames });
    }
    case 'undo': {
      const previous = history.past.at(-1);
      if (!previous) return history;
      return {
        past: history.past.slice(0, -1),
        present: previous,
        future: [history.present, ...history.future],
      };
    }
    case 'redo': {
      const [next, ...rest] = history.future;
      if (!next) return history;
      return { past: [...history.past, history.present], present: next, future: rest };
    }
    case 'reset':
      return startHistory(action.state);
  }
}

/** The adjustments a target has in a state. */
export function adjustmentsOf(state: TuningState, target: TuningTarget): Adjustments | undefined {
  return target.kind === 'roll' ? state.roll : state.frames[target.frameId];
}
