import { pino } from 'pino';
import type { Config } from './config';

export const createLogger = (config: Pick<Config, 'logLevel'>) =>
  pino({ level: config.logLevel, redact: ['req.headers.cookie', 'req.headers["x-csrf-token"]', 'res.headers["set-cookie"]'] });
