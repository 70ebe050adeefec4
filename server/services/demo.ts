// Loads the invented demo scenario (samples/demo/scenario.json) into an empty database.
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { calibrationVersion, type TankGeometry } from '@shared/calibration';
import type { Role, TankContents } from '@shared/schemas';
import type { Database } from '../db';
import { hashPassword } from './passwords';

interface Scenario {
  organisation: { name: string };
  farms: { key: string; name: string; timeZone: string; location: string }[];
  people: { email: string; name: string; role: Role; password: string; farms: string[] }[];
  tanks: {
    farm: string;
    code: string;
    name: string;
    contents: TankContents;
    contentsNote: string;
    walkOrder: number;
    geometry: TankGeometry;
    datumOffsetMm: number;
    outletHeightMm: number;
    safeFillLevelMm: number;
    lowStockL: number;
    specificGravity: number;
  }[];
}

export function readScenario(file = resolve(import.meta.dirname, '../../samples/demo/scenario.json')): Scenario {
  return JSON.parse(readFileSync(file, 'utf8')) as Scenario;
}

/** Loads the scenario; with onlyIfEmpty, does nothing when an organisation exists. Returns true when loaded. */
export async function loadDemoScenario(db: Database, opts: { onlyIfEmpty?: boolean } = {}): Promise<boolean> {
  const { Organisation, Farm, User, FarmAccess, Tank, TankCalibration, TankContentsPeriod } = db.models;
  if (opts.onlyIfEmpty && (await Organisation.count()) > 0) return false;
  const scenario = readScenario();
  const hashes = await Promise.all(scenario.people.map((p) => hashPassword(p.password)));
  await db.sequelize.transaction(async (transaction) => {
    const org = await Organisation.create({ name: scenario.organisation.name }, { transaction });
    const farmIds = new Map<string, number>();
    for (const f of scenario.farms) {
      const farm = await Farm.create({ organisationId: org.id, name: f.name, timeZone: f.timeZone, location: f.location, archivedAt: null }, { transaction });
      farmIds.set(f.key, farm.id);
    }
    for (const [i, p] of scenario.people.entries()) {
      const user = await User.create(
        { organisationId: org.id, email: p.email, name: p.name, role: p.role, passwordHash: hashes[i], lastSignInAt: null },
        { transaction },
      );
      for (const key of p.farms) {
        await FarmAccess.create({ userId: user.id, farmId: farmIds.get(key)!, organisationId: org.id }, { transaction });
      }
    }
    const since = new Date(Date.now() - 60 * 86_400_000);
    for (const { farm, ...t } of scenario.tanks) {
      const version = calibrationVersion(t.geometry, t.datumOffsetMm);
      const tank = await Tank.create({ ...t, organisationId: org.id, farmId: farmIds.get(farm)!, sensorHeightMm: null, calibrationVersion: version, archivedAt: null }, { transaction });
      await TankCalibration.create({ organisationId: org.id, tankId: tank.id, version, geometry: t.geometry, datumOffsetMm: t.datumOffsetMm }, { transaction });
      await TankContentsPeriod.create({ organisationId: org.id, tankId: tank.id, contents: t.contents, contentsNote: t.contentsNote, specificGravity: t.specificGravity, fromAt: since, toAt: null, changedById: null }, { transaction });
    }
  });
  return true;
}
