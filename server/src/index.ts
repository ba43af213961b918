import { ConfigError, loadConfig } from './config/config.js';
import { createApp } from './app.js';
import { startParts, stopParts } from './runtime.js';

async function main() {
  const config = loadConfig();
  const parts = await startParts(config);
  const app = createApp(parts);
  const server = app.listen(config.PORT, config.HOST, () => {
    parts.logger.info({ url: `http://${config.HOST}:${config.PORT}` }, 'Wingstage is listening');
  });
  server.on('error', (err) => {
    parts.logger.fatal({ err }, 'could not listen');
    process.exit(1);
  });

  let stopping = false;
  const stop = (signal: string) => {
    if (stopping) return;
    stopping = true;
    parts.logger.info({ signal }, 'shutting down');
    server.close(async () => {
      await stopParts(parts).catch((err) => parts.logger.error({ err }, 'error while stopping'));
      process.exit(0);
    });
    // Keep-alive connections would hold close() for seconds; end them now.
    server.closeAllConnections();
    setTimeout(() => process.exit(1), 10_000).unref();
  };
  process.on('SIGTERM', () => stop('SIGTERM'));
  process.on('SIGINT', () => stop('SIGINT'));
}

main().catch((err) => {
  if (err instanceof ConfigError) {
    console.error(err.message);
  } else {
    console.error('Wingstage could not start:', err);
  }
  process.exit(1);
});
