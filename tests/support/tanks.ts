import { calibrationVersion, type TankGeometry } from '@shared/calibration';
import type { TankContents } from '@shared/schemas';
import type { TestEnv } from './db';
import type { OrgFixture } from './fixtures';

/** A 1,000 mm wide, 1,500 mm tall vertical cylinder: 785.398 L per metre of level (π/4 · 1 m² · 1 m). */
export const CYLINDER: TankGeometry = { shape: 'vertical-cylinder', diameterMm: 1000, heightMm: 1500 };

/** A tank made directly in the database for tests. */
export async function makeTank(env: TestEnv, org: OrgFixture, farmId: number, opts: { code?: string; contents?: TankContents; geometry?: TankGeometry; datumOffsetMm?: number; lowStockL?: number } = {}) {
  const geometry = opts.geometry ?? CYLINDER;
  const datumOffsetMm = opts.datumOffsetMm ?? 0;
  const version = calibrationVersion(geometry, datumOffsetMm);
  const tank = await env.ctx.db.models.Tank.create({
    organisationId: org.organisationId, farmId, name: `Tank ${opts.code ?? 'T'}`, code: opts.code ?? 'T', contents: opts.contents ?? 'water', contentsNote: '', geometry,
    datumOffsetMm, outletHeightMm: 100, safeFillLevelMm: 1400, lowStockL: opts.lowStockL ?? 200, specificGravity: 1, sensorHeightMm: null, walkOrder: 0, calibrationVersion: version, archivedAt: null,
  });
  await env.ctx.db.models.TankCalibration.create({ organisationId: org.organisationId, tankId: tank.id, version, geometry, datumOffsetMm });
  await env.ctx.db.models.TankContentsPeriod.create({ organisationId: org.organisationId, tankId: tank.id, contents: tank.contents, contentsNote: '', specificGravity: 1, fromAt: new Date(Date.now() - 90 * 86_400_000), toAt: null, changedById: null });
  return tank;
}
