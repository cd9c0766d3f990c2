import type { RollEvent } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import { EventEmitter } from 'node:events';
import type { Database } from '../db/database';

// One bus per database handle: the queue and the routes of one server share it without being wired together.
const buses = new WeakMap<Kysely<Database>, EventEmitter>();

function busOf(db: Kysely<Database>): EventEmitter {
  let bus = buses.get(db);
  if (!bus) {
    bus = new EventEmitter();
    // one listener per open live stream; many operators may watch rolls at once
    bus.setMaxListeners(0);
    buses.set(db, bus);
  }
  return bus;
}

/** Tells every live stream of a roll what changed. */
export function publishRollEvent(db: Kysely<Database>, rollId: number, event: RollEvent): void {
  busOf(db).emit(`roll:${rollId}`, event);
}

/** Listens to a roll's changes; returns the function that stops listening. */
export function subscribeRollEvents(
  db: Kysely<Database>,
  rollId: number,
  listener: (event: RollEvent) => void,
): () => void {
  const bus = busOf(db);
  bus.on(`roll:${rollId}`, listener);
  return () => bus.off(`roll:${rollId}`, listener);
}

/** Streams open on a roll (for tests and health). */
export function rollListenerCount(db: Kysely<Database>, rollId: number): number {
  return busOf(db).listenerCount(`roll:${rollId}`);
}

/** Wakes the queue of this database when a job is added. */
export function onJobQueued(db: Kysely<Database>, listener: () => void): () => void {
  const bus = busOf(db);
  bus.on('job-queued', listener);
  return () => bus.off('job-queued', listener);
}

export function announceJobQueued(db: Kysely<Database>): void {
  busOf(db).emit('job-queued');
}

/** Ends every open live stream of this database (on shutdown, so the server need not wait for them). */
export function closeRollStreams(db: Kysely<Database>): void {
  busOf(db).emit('close-streams');
}

/** Runs `listener` when the streams are told to close; returns the function that stops listening. */
export function onCloseRollStreams(db: Kysely<Database>, listener: () => void): () => void {
  const bus = busOf(db);
  bus.on('close-streams', listener);
  return () => bus.off('close-streams', listener);
}
