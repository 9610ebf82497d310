/**
 * The local database driver is synchronous: a statement holds the server's thread until it ends.
 * Long writes therefore run as many short statements with this between them, which lets the event
 * loop answer health, reads and timers before the next one.
 */
export const yieldToOthers = (): Promise<void> => new Promise((r) => setImmediate(r));
