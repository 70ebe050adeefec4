// Production and development entry: parse settings, start, and shut down cleanly on signals.
import { loadConfig } from './config';
import { startServer } from './start';

const config = loadConfig();
const server = await startServer(config);
server.ctx.logger.info(`Brimstock is serving on http://${config.host}:${server.port}`);
// What start-up announces is for whoever started the process (a person, npm start, the tests' reader in
// scripts/lib/server-process.ts): logged at info whatever LOG_LEVEL lets through, as pino lines like the rest.
const announce = server.ctx.logger.child({ startup: true }, { level: 'info' });
if (server.firstOwnerLink) {
  announce.info({ event: 'first-owner-link', link: server.firstOwnerLink }, `No organisation exists yet: open ${server.firstOwnerLink} to make the first owner (the link works once, until the next start).`);
}
announce.info({ event: 'ready', url: config.publicUrl }, `Brimstock is ready: open ${config.publicUrl}`);

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
