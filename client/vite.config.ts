/**
 * Vite build of the light client. The Hono server serves client/dist; in development `npx vite
 * client` proxies /api to a running server (PORT, default 8417).
 */
import preact from '@preact/preset-vite';
import { defineConfig } from 'vite';

const root = import.meta.dirname;

export default defineConfig({
  root,
  plugins: [preact()],
  build: { outDir: 'dist', emptyOutDir: true, target: 'es2022', sourcemap: false },
  server: { proxy: { '/api': `http://127.0.0.1:${process.env.PORT ?? 8417}` } },
});
