import { randomUUID } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { stockFigures, usableCapacityL } from '@shared/readings';
import { useTestApp } from '../support/db';
import { call, makeOrganisation, signedIn } from '../support/fixtures';
import { CYLINDER, makeTank } from '../support/tanks';

const env = useTestApp();

describe('stock board tiles', () => {
  it('gives a tile its usable litres, the usable capacity and the percentage of it, from the shared figures', async () => {
    const org = await makeOrganisation(env);
    const tank = await makeTank(env, org, org.farmIds[0], { code: 'B1', lowStockL: 0 });
    const manager = await signedIn(env, org.users.manager.email);
    await call(manager, 'post', '/api/rounds', { farmId: org.farmIds[0], entries: [{ tankId: tank.id, readingMm: 700, idempotencyKey: randomUUID().replace(/-/g, '') }] }).expect(201);

    const board = (await manager.get('/api/board').expect(200)).body;
    const tile = board.farms.flatMap((f: { tanks: unknown[] }) => f.tanks).find((t: { tankId: number }) => t.tankId === tank.id);
    // The 1 m cylinder holds π/4 L per mm (hand derivation, V = π r² h): 600 mm above the 100 mm outlet of the
    // 1,300 mm between the outlet and the 1,400 mm fill line is 46.2 % of the usable capacity, not 700/1,500 of the brim.
    const perMm = Math.PI / 4;
    expect(tile.usableL).toBeCloseTo(600 * perMm, 6);
    expect(tile.usableCapacityL).toBeCloseTo(1300 * perMm, 6);
    expect(tile.percentOfUsableCapacity).toBeCloseTo((600 / 1300) * 100, 6);
    const shared = stockFigures({ grossL: tile.grossL, usableL: tile.usableL }, usableCapacityL(CYLINDER, { outletHeightMm: 100, safeFillLevelMm: 1400 }));
    expect(tile.percentOfUsableCapacity).toBe(shared.percentOfUsableCapacity);
    expect(tile).toMatchObject({ levelMm: 700, heightMm: 1500, datumOffsetMm: 0, outletHeightMm: 100, safeFillLevelMm: 1400 });
    expect(tile).not.toHaveProperty('percentFull');
    const water = board.totals.find((t: { contents: string }) => t.contents === 'water');
    expect(water.percentOfUsableCapacity).toBeCloseTo((600 / 1300) * 100, 6);
  });
});
