// Production and development entry: parse settings, start, and shut down cleanly on signals.
import { loadConfig } from './config';
import { startServer } from './start';

const config = loadConfig();
const server = await startServer(config);
server.ctx.logger.info(`Brimstock is serving on http://${config.host}:${server.port}`);
if (server.firstOwnerLink) console.log(`No organisation exists yet: open ${server.firstOwnerLink} to make the first owner (the link works once, until the next start).`);
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
