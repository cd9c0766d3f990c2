/**
 * Something main.ts starts before listening and stops on shutdown, in reverse order: local fakes (mail catcher,
 * payment fake), the job queue, periodic clean-ups.
 */
export interface BackgroundService {
  name: string;
  start(): Promise<void> | void;
  stop(): Promise<void> | void;
}
