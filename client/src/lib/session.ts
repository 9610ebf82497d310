/**
 * Sign-in for the session: a `?token=` in the address (the link `npm start` prints) is moved into
 * sessionStorage and removed from the address bar, so it is not bookmarked or shared by accident.
 */
const KEY = 'ew.token';

export function adoptTokenFromUrl(): void {
  const url = new URL(location.href);
  const token = url.searchParams.get('token');
  if (!token) return;
  sessionStorage.setItem(KEY, token);
  url.searchParams.delete('token');
  history.replaceState(null, '', url.pathname + url.search + url.hash);
}

export const sessionToken = (): string | null => sessionStorage.getItem(KEY);
export const setSessionToken = (token: string): void => sessionStorage.setItem(KEY, token.trim());
export const signOut = (): void => sessionStorage.removeItem(KEY);
