import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { ESLint } from 'eslint';
import { beforeAll, describe, expect, it } from 'vitest';

// The repository's own eslint.config.js, run through ESLint's Node API on planted files. Each
// fixture is linted as if it sat at a path inside the repository, so the zones are checked against
// the real folders and the real import resolution, while the fixtures stay out of `npm run lint`.
const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const RULE = 'import/no-restricted-paths';

let eslint: ESLint;
beforeAll(() => {
  eslint = new ESLint({ cwd: root, cache: false });
});

async function lintAs(fixture: string, asPath: string) {
  const code = readFileSync(join(root, 'lint/fixtures', fixture), 'utf8');
  const [result] = await eslint.lintText(code, { filePath: join(root, asPath) });
  if (!result) throw new Error(`ESLint returned nothing for ${asPath}`);
  return result.messages;
}

/** The boundary messages, as `line: text`, with anything else ESLint said kept visible on failure. */
async function boundaryHits(fixture: string, asPath: string) {
  const messages = await lintAs(fixture, asPath);
  expect(messages.filter((m) => m.ruleId !== RULE).map((m) => `${m.ruleId}: ${m.message}`)).toEqual([]);
  return messages.filter((m) => m.ruleId === RULE).map((m) => ({ line: m.line, message: m.message }));
}

describe('import boundaries (eslint.config.js)', () => {
  it('when a feature imports another feature by the @/ alias, then the import is reported', async () => {
    const hits = await boundaryHits('cross-feature-alias.ts', 'client/src/features/aircraft/components/planted.ts');
    expect(hits).toHaveLength(1);
    expect(hits[0]!.line).toBe(2);
    expect(hits[0]!.message).toContain('"@/features/jobs/api/keys"');
    expect(hits[0]!.message).toContain('A feature imports no other feature');
  });

  it('when a feature imports another feature by a relative path, then the import is reported', async () => {
    const hits = await boundaryHits('cross-feature-relative.ts', 'client/src/features/aircraft/components/planted.ts');
    expect(hits).toHaveLength(1);
    expect(hits[0]!.message).toContain('"../../jobs/api/keys"');
  });

  it('when a feature test imports another feature, then it is reported too', async () => {
    const hits = await boundaryHits('cross-feature-alias.ts', 'client/src/features/estimates/components/planted.test.tsx');
    expect(hits).toHaveLength(1);
  });

  it('when client/src/lib imports a feature, then the import is reported', async () => {
    const hits = await boundaryHits('lib-imports-feature.ts', 'client/src/lib/planted.ts');
    expect(hits).toHaveLength(1);
    expect(hits[0]!.message).toContain('import no feature and no route');
  });

  it('when shared imports server code, then the import is reported', async () => {
    const hits = await boundaryHits('shared-imports-server.ts', 'shared/src/planted.ts');
    expect(hits).toHaveLength(1);
    expect(hits[0]!.message).toContain('"../../server/src/errors/app-error.js"');
    expect(hits[0]!.message).toContain('shared is used by both client and server');
  });

  it('when server code imports client code, then the import is reported', async () => {
    const hits = await boundaryHits('server-imports-client.ts', 'server/src/planted.ts');
    expect(hits).toHaveLength(1);
    expect(hits[0]!.message).toContain('The server (its code and its tests) imports no client code');
  });

  it('when a server test imports client code, then the import is reported', async () => {
    const hits = await boundaryHits('server-imports-client.ts', 'server/test/planted.test.ts');
    expect(hits).toHaveLength(1);
    expect(hits[0]!.message).toContain('"../../client/src/lib/format.js"');
  });

  it('when a migration imports live values from shared, then the import is reported', async () => {
    const hits = await boundaryHits('migration-imports-shared.ts', 'db/migrations/9999-planted.ts');
    expect(hits).toHaveLength(1);
    expect(hits[0]!.message).toContain('A migration carries its own literal values');
  });

  it('when a feature imports its own files, lib, components and shared, then nothing is reported', async () => {
    expect(await lintAs('allowed.ts', 'client/src/features/aircraft/components/planted.tsx')).toEqual([]);
  });

  it('when an amount is written with "£" by hand, in a string or on a page, then both are reported', async () => {
    const messages = await lintAs('money-by-hand.tsx', 'client/src/features/aircraft/components/planted.tsx');
    const hits = messages.filter((m) => m.ruleId === 'no-restricted-syntax');
    expect(hits.map((m) => m.line)).toEqual([2, 3]);
    expect(hits[0]!.message).toContain('formatMoney');
  });

  it('when the whole repository is linted, then the planted fixtures are left out', async () => {
    expect(await eslint.isPathIgnored(join(root, 'lint/fixtures/cross-feature-alias.ts'))).toBe(true);
    expect(await eslint.isPathIgnored(join(root, 'lint/zones.test.ts'))).toBe(false);
  });
});
