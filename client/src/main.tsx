import { render } from 'preact';
import { App } from './app.tsx';
import { adoptTokenFromUrl } from './lib/session.ts';
import './styles.css';

adoptTokenFromUrl();
render(<App />, document.getElementById('app')!);
