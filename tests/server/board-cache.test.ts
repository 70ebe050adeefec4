// The kept copy of the stock board: the same answer (and entity tag) while nothing changed, and a
// fresh one after any change to readings, tanks or farms — through the API or straight in the database.
import { randomUUID } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { readingToVolumes } from '@shared/readings';
import { useTestApp } from '../support/db';
import { call, makeOrganisation, signedIn } from '../support/fixtures';
import { makeTank } from '../support/tanks';
import { insertReadings } from '../../server/services/readings';

const env = useTestApp();
const key = () => randomUUID().replace(/-/g, '');
type Board = { farms: { farmId: number; tanks: { tankId: number; name: string; grossL: number | null }[] }[] };
const tileOf = (board: Board, tankId: number) => board.farms.flatMap((f) => f.tanks).find((t) => t.tankId === tankId);

describe('GET /api/board kept copy', () => {
  it('answers the same board while nothing changed and a new one after a round, a rename or a direct reading', async () => {
    const org = await makeOrganisation(env);
    const tank = await makeTank(env, org, org.farmIds[0], { code: 'K1' });
    const manager = await signedIn(env, org.users.manager.email);
    await call(manager, 'post', '/api/rounds', { farmId: org.farmIds[0], entries: [{ tankId: tank.id, readingMm: 500, idempotencyKey: key() }] }).expect(201);

    // The first board queues the new reading's use rate; once it is stored the board settles.
    let previous = '';
    await expect.poll(async () => {
      const tag = (await manager.get('/api/board').expect(200)).headers.etag;
      const settled = tag === previous;
      previous = tag;
      return settled;
    }, { timeout: 5000, interval: 100 }).toBe(true);
    const first = await manager.get('/api/board').expect(200);
    const again = await manager.get('/api/board').expect(200);
    expect(again.headers.etag).toBe(first.headers.etag);
    expect(again.text).toBe(first.text);
    await manager.get('/api/board').set('If-None-Match', first.headers.etag).expect(304);

    await call(manager, 'post', '/api/rounds', { farmId: org.farmIds[0], entries: [{ tankId: tank.id, readingMm: 700, idempotencyKey: key() }] }).expect(201);
    const afterRound = await manager.get('/api/board').expect(200);
    expect(afterRound.headers.etag).not.toBe(first.headers.etag);
    expect(tileOf(afterRound.body, tank.id)!.grossL).toBeGreaterThan(tileOf(first.body, tank.id)!.grossL!);

    await call(manager, 'patch', `/api/tanks/${tank.id}`, { name: 'Renamed header tank' }).expect(200);
    expect(tileOf((await manager.get('/api/board').expect(200)).body, tank.id)!.name).toBe('Renamed header tank');

    // A reading stored without any request or event of this server (another process, a script) is
    // seen too, once the kept copy's fingerprint is checked again (at most a second later).
    const t = (await env.ctx.db.models.Tank.findByPk(tank.id))!;
    const v = readingToVolumes({ geometry: t.geometry, datumOffsetMm: t.datumOffsetMm, outletHeightMm: t.outletHeightMm, safeFillLevelMm: t.safeFillLevelMm, specificGravity: t.specificGravity }, { kind: 'level', levelMm: 900 });
    if (!v.ok) throw new Error(v.reason);
    await env.ctx.db.sequelize.transaction((transaction) =>
      insertReadings(env.ctx, [{ organisationId: t.organisationId, farmId: t.farmId, tankId: t.id, takenAt: new Date(), source: 'round', levelMm: 900, grossL: v.grossL, usableL: v.usableL, temperatureC: null, calibrationVersion: t.calibrationVersion, enteredById: null, importId: null, note: '', idempotencyKey: null }], new Map([[t.farmId, 'Europe/Dublin']]), transaction),
    );
    await expect.poll(async () => tileOf((await manager.get('/api/board').expect(200)).body, tank.id)!.grossL, { timeout: 3000, interval: 100 }).toBeCloseTo(v.grossL, 6);
  });

  it('sends the kept copy gzipped to a client that accepts it, and plain to one that does not', async () => {
    const org = await makeOrganisation(env);
    const tank = await makeTank(env, org, org.farmIds[0], { code: 'Z1' });
    const manager = await signedIn(env, org.users.manager.email);
    const zipped = await manager.get('/api/board').set('Accept-Encoding', 'gzip').expect(200);
    expect(zipped.headers['content-encoding']).toBe('gzip');
    expect(zipped.headers.vary).toMatch(/Accept-Encoding/i);
    const plain = await manager.get('/api/board').set('Accept-Encoding', 'identity').expect(200);
    expect(plain.headers['content-encoding']).toBeUndefined();
    expect(plain.headers.etag).not.toBe(zipped.headers.etag);
    await manager.get('/api/board').set('Accept-Encoding', 'gzip').set('If-None-Match', zipped.headers.etag).expect(304);
    expect(zipped.body).toEqual(plain.body);
    expect(tileOf(plain.body, tank.id)).toBeDefined();
  });

  it('keeps one copy per farm set, so a worker of one farm never gets the manager\'s board', async () => {
    const org = await makeOrganisation(env, { farms: 2 });
    const own = await makeTank(env, org, org.farmIds[0], { code: 'O1' });
    const other = await makeTank(env, org, org.farmIds[1], { code: 'X1' });
    const manager = await signedIn(env, org.users.manager.email);
    const worker = await signedIn(env, org.users.worker.email);
    const all = (await manager.get('/api/board').expect(200)).body as Board;
    expect(tileOf(all, other.id)).toBeDefined();
    const mine = (await worker.get('/api/board').expect(200)).body as Board;
    expect(tileOf(mine, own.id)).toBeDefined();
    expect(tileOf(mine, other.id)).toBeUndefined();
  });
});
