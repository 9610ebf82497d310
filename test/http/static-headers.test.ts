/**
 * The client's own files carry the same security headers as the API's answers: a policy that
 * lets only this server's scripts, styles and data in and no other page frame them, and no
 * content-type guessing. The folder and its files are made up for the test.
 */
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/http/app.ts';

let dir: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'epochwright-static-'));
  mkdirSync(join(dir, 'assets'));
  writeFileSync(join(dir, 'index.html'), '<!doctype html><title>t</title>');
  writeFileSync(join(dir, 'assets', 'app-1a2b.js'), 'export {};');
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('static responses', () => {
  it.each([
    ['/', 'text/html'],
    ['/assets/app-1a2b.js', 'javascript'],
    ['/targets/3', 'text/html'], // a client-side address: index.html
  ])('%s carries CSP, nosniff and no framing', async (path, type) => {
    const res = await createApp({ clientDir: dir }).request(path);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toContain(type);
    const csp = res.headers.get('content-security-policy') ?? '';
    expect(csp).toMatch(/frame-ancestors 'none'/); // CSP Level 2, frame-ancestors (W3C, from memory)
    expect(csp).toMatch(/default-src 'self'/);
    expect(res.headers.get('x-content-type-options')).toBe('nosniff'); // WHATWG Fetch, X-Content-Type-Options (from memory)
    expect(res.headers.get('x-frame-options')).toBe('DENY');
  });
});
