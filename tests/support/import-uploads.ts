// Logger-file uploads for the import API tests: the level mapping and files they send, the upload
// request itself, a worker with a tank to import into, and the stored upload files.
import { readdirSync } from 'node:fs';
import type { ImportMappingInput } from '@shared/imports';
import type { TestEnv } from './db';
import { makeOrganisation, signedIn, type Agent } from './fixtures';
import { makeTank } from './tanks';

export const LEVEL_MAPPING: ImportMappingInput = { delimiter: ',', hasHeader: true, timestamp: { column: 'time', format: 'iso8601' }, value: { column: 'level_mm', kind: 'level', unit: 'mm' } };

/** A level file: one row per [ISO time, level in mm], with a header row. */
export const levelCsv = (rows: [string, string | number][]) => `time,level_mm\n${rows.map(([t, v]) => `${t},${v}`).join('\n')}\n`;
/** n rows an hour apart from `startIso`, level going down 10 mm an hour from 1,200 mm. */
export const hourly = (startIso: string, n: number): [string, number][] => Array.from({ length: n }, (_, i) => [new Date(Date.parse(startIso) + i * 3_600_000).toISOString(), 1200 - 10 * i]);

export interface UploadOpts {
  tankId: number;
  files: { name: string; content: string | Buffer }[];
  mapping?: ImportMappingInput | string;
  policy?: 'reject-file' | 'valid-rows';
}
export function upload(agent: Agent, o: UploadOpts) {
  let req = agent.post('/api/imports').set('x-csrf-token', agent.csrf).field('tankId', String(o.tankId)).field('mapping', typeof o.mapping === 'string' ? o.mapping : JSON.stringify(o.mapping ?? LEVEL_MAPPING));
  if (o.policy) req = req.field('policy', o.policy);
  for (const f of o.files) req = req.attach('files', Buffer.isBuffer(f.content) ? f.content : Buffer.from(f.content, 'utf8'), { filename: f.name, contentType: 'text/csv' });
  return req;
}

export async function world(env: TestEnv) {
  const org = await makeOrganisation(env);
  const tank = await makeTank(env, org, org.farmIds[0], { code: 'LG' });
  const worker = await signedIn(env, org.users.worker.email);
  return { org, tank, worker };
}

export const storedFiles = (env: TestEnv) => {
  try {
    return readdirSync(env.ctx.config.uploadDir);
  } catch {
    return [];
  }
};
