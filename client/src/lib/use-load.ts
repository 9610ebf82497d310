/** Load data for a view: { data, error, loading, reload }; a newer load wins over a slower older one. */
import { useCallback, useEffect, useRef, useState } from 'preact/hooks';

export interface Loaded<T> {
  data: T | undefined;
  error: unknown;
  loading: boolean;
  reload: () => void;
}

export function useLoad<T>(load: () => Promise<T>, deps: unknown[]): Loaded<T> {
  const [state, setState] = useState<{ data: T | undefined; error: unknown; loading: boolean }>({
    data: undefined,
    error: undefined,
    loading: true,
  });
  const seq = useRef(0);
  const run = useCallback(() => {
    const mine = ++seq.current;
    setState((s) => ({ ...s, loading: true }));
    load().then(
      (data) => mine === seq.current && setState({ data, error: undefined, loading: false }),
      (error: unknown) =>
        mine === seq.current && setState({ data: undefined, error, loading: false }),
    );
    // The caller's deps decide when to reload, not the loader's identity.
  }, deps);
  useEffect(run, [run]);
  return { ...state, reload: run };
}
