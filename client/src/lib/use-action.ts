/**
 * One request at a time from a button or a form: `busy` while it runs, its error kept for
 * <ErrorLine>, optionally reworded (a 409 says what to do next).
 */
import { useState } from 'preact/hooks';

export function useAction() {
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<unknown>(null);
  const run = async (
    action: () => Promise<void>,
    reword: (e: unknown) => unknown = (e) => e,
  ): Promise<void> => {
    setBusy(true);
    setError(null);
    try {
      await action();
    } catch (e) {
      setError(reword(e));
    } finally {
      setBusy(false);
    }
  };
  return { busy, error, run };
}
