import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { MailQueue } from '../src/mail/mail-queue.js';
import { startTestServer, testConfig, uniq, waitForMail, type TestServer } from './helpers.js';

let server: TestServer;

beforeAll(async () => {
  server = await startTestServer({ MAIL_WORKER: 'false' });
});
afterAll(async () => {
  await server?.close();
});

async function until<T>(what: string, check: () => Promise<T | null | undefined | false>, timeoutMs = 20_000): Promise<T> {
  const end = Date.now() + timeoutMs;
  while (Date.now() < end) {
    const v = await check();
    if (v) return v;
    await new Promise((r) => setTimeout(r, 300));
  }
  throw new Error(`timed out waiting for ${what}`);
}

describe('mail queue', () => {
  it('when the mail server is down, then the message waits to be retried and is delivered once it is back', async () => {
    const queue = `mail-outage-${uniq()}`;
    const to = `outage-${uniq()}@test.example`;
    const msg = { to, subject: 'Queued through an outage', text: 'Hello after the outage.', html: '<p>Hello after the outage.</p>' };
    const { sequelize, logger } = server.parts;

    // Port 1 refuses connections: the worker's delivery fails like an SMTP outage.
    const down = new MailQueue(testConfig({ SMTP_PORT: '1' }), sequelize, logger, { queue, retryDelaySeconds: 1, retryLimit: 5 });
    await down.start();
    const id = (await down.enqueue(msg))!;
    const waiting = await until('a failed first try', async () => {
      const s = await down.status(id);
      return s && s.state === 'retry' && s.retryCount >= 1 ? s : null;
    });
    expect(waiting.state).toBe('retry');
    await down.stop();

    const up = new MailQueue(testConfig(), sequelize, logger, { queue, retryDelaySeconds: 1, retryLimit: 5 });
    await up.start();
    try {
      const mail = await waitForMail(to, (m) => m.subject === msg.subject, 30_000);
      expect(mail.text).toContain('Hello after the outage.');
      const done = await until('completion', async () => {
        const s = await up.status(id);
        return s?.state === 'completed' ? s : null;
      });
      expect(done.retryCount).toBeGreaterThanOrEqual(1);
    } finally {
      await up.stop();
    }
  });

  it('when the queue is not started, then enqueueing fails loudly instead of dropping the message', async () => {
    const q = new MailQueue(testConfig(), server.parts.sequelize, server.parts.logger, { queue: `mail-idle-${uniq()}` });
    await expect(q.enqueue({ to: 'x@test.example', subject: 's', text: 't', html: 'h' })).rejects.toThrow(/not started/);
  });
});
