/**
 * client/src/api/schema.d.ts is generated from the server's OpenAPI document: this regenerates it
 * and fails when the committed file is stale (a route's schema changed without `npm run api-types`).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { SCHEMA_FILE, apiTypesSource } from '../../tools/api-types/generate.ts';

describe('generated API types', () => {
  it('client/src/api/schema.d.ts matches the OpenAPI document (else run `npm run api-types`)', async () => {
    const committed = readFileSync(SCHEMA_FILE, 'utf8');
    const fresh = await apiTypesSource();
    if (fresh !== committed) {
      const a = committed.split('\n');
      const b = fresh.split('\n');
      const line = a.findIndex((l, i) => l !== b[i]);
      expect.fail(
        `client/src/api/schema.d.ts is stale from line ${line + 1} ` +
          `(committed ${JSON.stringify(a[line])}, generated ${JSON.stringify(b[line])}): run \`npm run api-types\` and commit it`,
      );
    }
    expect(fresh.length).toBeGreaterThan(1000);
  });
});
