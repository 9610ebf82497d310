/**
 * The local database driver is synchronous: a statement holds the server's thread until it ends.
 * Long writes therefore run as many short statements with this between them, which lets the event
 * loop answer health, reads and timers before the next one.
 */
export const yieldToOthers = (): Promise<void> => new Promise((r) => setImmediate(r));

/** Rows read per statement by `readInPages`: a page holds the server's thread a few milliseconds. */
export const PAGE_ROWS = 500;

/**
 * Every row of a query read in pages of PAGE_ROWS by ascending id (`page(afterId, limit)` gives the
 * next rows with an id above `afterId`, in id order), with the event loop free between pages: a
 * read of 100,000 measurements in one statement held the server's thread for seconds.
 */
export async function readInPages<R>(
  page: (afterId: number, limit: number) => Promise<R[]>,
  idOf: (row: R) => number,
): Promise<R[]> {
  const out: R[] = [];
  for (let after = 0; ; ) {
    const rows = await page(after, PAGE_ROWS);
    for (const r of rows) out.push(r);
    if (rows.length < PAGE_ROWS) return out;
    after = idOf(rows[rows.length - 1]!);
    await yieldToOthers();
  }
}
