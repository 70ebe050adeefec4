// Production and development entry: parse settings, start, and shut down cleanly on signals.
import { loadConfig } from './config';
import { startServer } from './start';

const config = loadConfig();
const server = await startServer(config);
server.ctx.logger.info(`Brimstock is serving on http://${config.host}:${server.port}`);
console.log(`Brimstock is ready: open ${config.publicUrl}`);

let stopping = false;
for (const signal of ['SIGINT', 'SIGTERM'] as const) {
  process.on(signal, async () => {
    if (stopping) return;
    stopping = true;
    server.ctx.logger.info(`${signal}: shutting down`);
    await server.close();
    process.exit(0);
  });
}
