/** A small history router: paths are the views' addresses, so a reload or a shared link lands on the same view. */
import { useEffect, useState } from 'preact/hooks';

const listeners = new Set<() => void>();
const notify = () =>
  listeners.forEach((f) => {
    f();
  });
addEventListener('popstate', notify);

export function navigate(path: string): void {
  if (path === location.pathname + location.search) return;
  history.pushState(null, '', path);
  scrollTo(0, 0);
  notify();
}

export function usePath(): string {
  const [path, setPath] = useState(location.pathname + location.search);
  useEffect(() => {
    const f = () => setPath(location.pathname + location.search);
    listeners.add(f);
    return () => void listeners.delete(f);
  }, []);
  return path;
}

/** Follow same-origin links without a page load (modifier clicks still open new tabs). */
export function interceptLinks(e: MouseEvent): void {
  if (e.defaultPrevented || e.button !== 0 || e.metaKey || e.ctrlKey || e.shiftKey || e.altKey)
    return;
  const a = (e.target as Element).closest?.('a');
  const href = a?.getAttribute('href');
  if (
    !a ||
    !href?.startsWith('/') ||
    href.startsWith('/api') ||
    a.hasAttribute('download') ||
    a.target
  )
    return;
  e.preventDefault();
  navigate(href);
}

/** Match "/targets/:id" against a path; returns the parameters or null. */
export function match(pattern: string, path: string): Record<string, string> | null {
  const p = pattern.split('/');
  const s = (path.split('?')[0] ?? '').split('/');
  if (p.length !== s.length) return null;
  const out: Record<string, string> = {};
  for (let i = 0; i < p.length; i++) {
    const a = p[i] ?? '';
    const b = decodeURIComponent(s[i] ?? '');
    if (a.startsWith(':')) out[a.slice(1)] = b;
    else if (a !== b) return null;
  }
  return out;
}
