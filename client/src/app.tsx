/** The shell: sign-in, the signed-in user's role, theme, navigation, and the view for the address. */
import { useEffect, useState } from 'preact/hooks';
import { api, type Me } from './api/client.ts';
import { interceptLinks, match, usePath } from './lib/router.ts';
import { sessionToken, setSessionToken, signOut } from './lib/session.ts';
import { CautionScope, ErrorLine, MeContext } from './lib/ui.tsx';
import { OverviewView } from './views/overview.tsx';
import { TargetView } from './views/target.tsx';
import { NightView } from './views/night.tsx';
import { ReportView } from './views/report.tsx';
import { SeasonView } from './views/season.tsx';
import { RecordsView } from './views/records.tsx';
import { SiteView, SitesView } from './views/site.tsx';
import { TimeRequestView } from './views/time-request.tsx';
import { NightsView } from './views/nights.tsx';

type Theme = 'night' | 'day';

function route(path: string) {
  const target = match('/targets/:id', path);
  if (target) return <TargetView id={Number(target.id)} />;
  const report = match('/nights/:id/report', path);
  if (report) return <ReportView nightId={Number(report.id)} />;
  const night = match('/nights/:id', path);
  if (night) return <NightView id={Number(night.id)} />;
  const site = match('/sites/:id', path);
  if (site) return <SiteView id={Number(site.id)} />;
  if (match('/sites', path)) return <SitesView />;
  if (match('/time-request', path)) return <TimeRequestView />;
  if (match('/nights', path)) return <NightsView />;
  if (match('/season', path)) return <SeasonView />;
  if (match('/records', path)) return <RecordsView />;
  if (match('/', path)) return <OverviewView />;
  return (
    <p class="panel">
      Nothing lives at {path}. <a href="/">Back to the campaign</a>.
    </p>
  );
}

function SignIn({ error, onToken }: { error: unknown; onToken: (t: string) => void }) {
  const [value, setValue] = useState('');
  return (
    <form
      class="panel sign-in"
      onSubmit={(e) => {
        e.preventDefault();
        onToken(value);
      }}
    >
      <h1>Sign in</h1>
      <p>
        Open the sign-in link that <code>npm start</code> printed on first start, or paste a token
        from <code>epochwright account add</code>.
      </p>
      <label>
        Token{' '}
        <input
          name="token"
          type="password"
          autoComplete="off"
          value={value}
          onInput={(e) => setValue(e.currentTarget.value)}
        />
      </label>
      <button type="submit">Sign in</button>
      <ErrorLine error={error} />
    </form>
  );
}

export function App() {
  const path = usePath();
  const [theme, setTheme] = useState<Theme>(
    (document.documentElement.dataset.theme as Theme) || 'night',
  );
  const [me, setMe] = useState<Me | null>(null);
  const [authError, setAuthError] = useState<unknown>(null);
  const [tokenTick, setTokenTick] = useState(0);
  // Same-origin links navigate in place: one listener for the whole page.
  useEffect(() => {
    document.addEventListener('click', interceptLinks);
    return () => document.removeEventListener('click', interceptLinks);
  }, []);
  useEffect(() => {
    document.documentElement.dataset.theme = theme;
    localStorage.setItem('ew.theme', theme);
  }, [theme]);
  useEffect(() => {
    if (!sessionToken()) return;
    api.GET('/me').then(setMe, (e: unknown) => {
      setAuthError(e);
      signOut();
      setMe(null);
    });
  }, [tokenTick]);
  return (
    <MeContext.Provider value={me}>
      <div class="shell">
        <a class="skip" href="#main">
          Skip to content
        </a>
        <TopBar
          path={path}
          me={me}
          theme={theme}
          onTheme={setTheme}
          onSignOut={() => {
            signOut();
            setMe(null);
          }}
        />
        <main id="main" tabIndex={-1}>
          {me ? (
            <CautionScope key={path}>{route(path)}</CautionScope>
          ) : sessionToken() && !authError ? (
            <p class="loading">Signing in…</p>
          ) : (
            <SignIn
              error={authError}
              onToken={(t) => {
                setSessionToken(t);
                setAuthError(null);
                setTokenTick(tokenTick + 1);
              }}
            />
          )}
        </main>
      </div>
    </MeContext.Provider>
  );
}

const NAV = [
  ['/', 'Campaign'],
  ['/nights', 'Nights'],
  ['/season', 'Season'],
  ['/sites', 'Sites'],
  ['/time-request', 'Time request'],
  ['/records', 'Records'],
] as const;

/** The word mark, the views, who is signed in, the theme switch and signing out. */
function TopBar(p: {
  path: string;
  me: Me | null;
  theme: Theme;
  onTheme: (t: Theme) => void;
  onSignOut: () => void;
}) {
  const { path, me, theme, onTheme, onSignOut } = p;
  return (
    <header class="topbar">
      <a class="wordmark" href="/">
        <span class="mark" aria-hidden="true">
          ◜◞
        </span>{' '}
        epochwright
      </a>
      <nav aria-label="views">
        {NAV.map(([href, label]) => (
          <a
            key={href}
            href={href}
            aria-current={
              (href === '/' ? path === '/' || path.startsWith('/?') : path.startsWith(href))
                ? 'page'
                : undefined
            }
          >
            {label}
          </a>
        ))}
      </nav>
      <div class="who">
        {me && (
          <span class={`role role-${me.role}`} title="your role on this server">
            {me.name} · {me.role}
          </span>
        )}
        <button
          type="button"
          class="ghost"
          onClick={() => onTheme(theme === 'night' ? 'day' : 'night')}
          aria-label={`switch to the ${theme === 'night' ? 'day' : 'night'} theme`}
        >
          {theme === 'night' ? 'Day theme' : 'Night theme'}
        </button>
        {me && (
          <button type="button" class="ghost" onClick={onSignOut}>
            Sign out
          </button>
        )}
      </div>
    </header>
  );
}
