// Logger-file uploads for the bad-input import tests: level files at hours no other file of the run
// uses, the upload request with a declared type per file, the stored readings and upload files to
// compare before and after, and the promise every answer keeps (below 500, explained, no stack).
import { readdirSync } from 'node:fs';
import { expect } from 'vitest';
import type { ImportMappingInput } from '@shared/imports';
import type { TestEnv } from './db';
import { makeOrganisation, signedIn, type Agent } from './fixtures';
import { makeTank } from './tanks';

export const LEVEL_MAPPING: ImportMappingInput = { delimiter: ',', hasHeader: true, timestamp: { column: 'time', format: 'iso8601' }, value: { column: 'level_mm', kind: 'level', unit: 'mm' } };
export const AUTO_MAPPING: ImportMappingInput = { ...LEVEL_MAPPING, delimiter: 'auto' };

/** A level file with a header row: one row per hour from `startMs`, 1,200 mm going down 10 mm an hour. */
export const levelCsv = (startMs: number, n: number) =>
  `time,level_mm\n${Array.from({ length: n }, (_, i) => `${new Date(startMs + i * 3_600_000).toISOString()},${1200 - 10 * i}`).join('\n')}\n`;

// Each file gets hours of its own, so no two files of this test share bytes or instants by chance.
let nextStart = Date.parse('2020-01-01T00:00:00Z');
export const freshStart = () => (nextStart += 2 * 86_400_000);

export interface FileSpec {
  name: string;
  content: string | Buffer;
  type?: string;
}
export function upload(agent: Agent, tankId: number, files: FileSpec[], o: { mapping?: ImportMappingInput; policy?: string } = {}) {
  let req = agent.post('/api/imports').set('x-csrf-token', agent.csrf).field('tankId', String(tankId)).field('mapping', JSON.stringify(o.mapping ?? LEVEL_MAPPING));
  if (o.policy) req = req.field('policy', o.policy);
  for (const f of files) req = req.attach('files', Buffer.isBuffer(f.content) ? f.content : Buffer.from(f.content, 'utf8'), { filename: f.name, contentType: f.type ?? 'text/csv' });
  return req;
}

export const storedFiles = (env: TestEnv) => {
  try {
    return readdirSync(env.ctx.config.uploadDir).sort();
  } catch {
    return [];
  }
};

/** The tank's stored readings as comparable text (instant, source, level, litres). */
export async function readingsOf(env: TestEnv, tankId: number): Promise<string[]> {
  const rows = await env.ctx.db.models.Reading.findAll({ where: { tankId }, order: [['takenAt', 'ASC'], ['id', 'ASC']] });
  return rows.map((r) => `${r.takenAt.toISOString()} ${r.source} ${r.levelMm} ${r.grossL} ${r.usableL}`);
}

export interface ImportBody {
  id: number;
  status: string;
  error: string | null;
  rowsTotal: number;
  rowsNew: number;
  rowsRejected: number;
  rejectedPreview: { line: number; field: string; value: string; reason: string }[];
}

/** The common promise of every answer: below 500, a JSON error with a message (no stack) or import records that explain themselves. */
export function expectExplained(res: { status: number; body: { error?: { message?: unknown }; imports?: ImportBody[] }; text: string }) {
  expect(res.status, res.text).toBeLessThan(500);
  expect(res.text).not.toMatch(/\bat .+\.(ts|js):\d+/);
  if (res.status >= 400) {
    expect(typeof res.body.error?.message).toBe('string');
    expect((res.body.error!.message as string).length).toBeGreaterThan(10);
    return;
  }
  expect(res.status).toBe(201);
  for (const imp of res.body.imports!) {
    expect(['imported', 'rejected', 'duplicate']).toContain(imp.status);
    if (imp.status === 'rejected') expect(imp.error?.length ?? 0).toBeGreaterThan(10);
    for (const p of imp.rejectedPreview) {
      expect(p.line).toBeGreaterThanOrEqual(1);
      expect(p.reason.length).toBeGreaterThan(5);
    }
  }
}

export const changedReadings = (res: { status: number; body: { imports?: ImportBody[] } }) => res.status === 201 && res.body.imports!.some((i) => i.status === 'imported' && i.rowsNew > 0);

export async function world(env: TestEnv) {
  const org = await makeOrganisation(env);
  const tank = await makeTank(env, org, org.farmIds[0], { code: 'FZ' });
  const worker = await signedIn(env, org.users.worker.email);
  // Readings that are there before the bad input, so "unchanged" means something.
  await upload(worker, tank.id, [{ name: 'base.csv', content: levelCsv(freshStart(), 5) }]).expect(201);
  return { org, tank, worker };
}
