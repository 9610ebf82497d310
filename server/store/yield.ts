/**
 * The local database driver is synchronous: a statement holds the server's thread until it ends.
 * Long writes therefore run as many short statements with this between them, which lets the event
 * loop answer health, reads and timers before the next one.
 */
export const yieldToOthers = (): Promise<void> => new Promise((r) => setImmediate(r));

/** Rows read per statement by `readInPages`: a page holds the server's thread a few milliseconds. */
export const PAGE_ROWS = 500;

/**
 * Every row of a query read in pages of PAGE_ROWS, with the event loop free between pages: a read
 * of 100,000 measurements in one statement held the server's thread for seconds. `page(after,
 * limit)` gives the next rows after the key `after` (undefined for the first page) in key order;
 * `keyOf` gives a row's key, and `keep` what is kept of each row, or undefined to drop it (applied a
 * page at a time, so no long loop over every row follows the read).
 */
export async function readInPages<R, K, T = R>(
  page: (after: K | undefined, limit: number) => Promise<R[]>,
  keyOf: (row: R) => K,
  keep: (row: R) => T | undefined = (row) => row as unknown as T,
): Promise<T[]> {
  const out: T[] = [];
  for (let after: K | undefined; ; ) {
    const rows = await page(after, PAGE_ROWS);
    for (const r of rows) {
      const kept = keep(r);
      if (kept !== undefined) out.push(kept);
    }
    if (rows.length < PAGE_ROWS) return out;
    after = keyOf(rows[rows.length - 1]!);
    await yieldToOthers();
  }
}
