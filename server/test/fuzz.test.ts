import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from './helpers.js';
import { fuzzRoutes, fuzzWorld, type FuzzWorld } from './support/http-fuzz.js';

let server: TestServer;
let world: FuzzWorld;

beforeAll(async () => {
  // Sign-in keeps its real limits; the account guessed at is one nobody else in this file uses.
  server = await startTestServer({ MAIL_WORKER: 'false' });
  world = await fuzzWorld(server.app);
});
afterAll(async () => {
  await server?.close();
});

describe('every write route under fuzzing', () => {
  it('when each write route gets random and hostile bodies, then none answers 5xx and no refused request writes anything', async () => {
    const tally = await fuzzRoutes(server.app, world, 12);
    expect(tally.sent).toBe(world.routes.length * 12);
    expect(tally.serverErrors).toEqual([]);
    expect(tally.writesOnRefusal).toEqual([]);
    // The fuzzing reached past validation too: some requests were accepted.
    expect(Object.keys(tally.byStatus).some((s) => s.startsWith('2'))).toBe(true);
  });
});
