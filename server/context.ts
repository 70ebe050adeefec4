import type { EventEmitter } from 'node:events';
import type { Logger } from 'pino';
import type { Cluster } from './cluster';
import type { Config } from './config';
import type { Database } from './db';
import type { Mailer } from './mail/mailer';
import type { TextSender } from './sms/sender';

/** What every route and service needs, built once at start-up and passed in (no globals). */
export interface AppContext {
  config: Config;
  db: Database;
  mailer: Mailer;
  /** Texts through the SMS service's SDK (server/sms/sender.ts). */
  texts: TextSender;
  logger: Logger;
  /** In-process events: 'readings' { organisationId, farmIds } after each commit that changes stock. */
  events: EventEmitter;
  /** What the server processes share (server/cluster); absent: this process alone, reached through `clusterOf`. */
  cluster?: Cluster;
}
