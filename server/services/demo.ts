// Loads the invented demo scenario (samples/demo/scenario.json) into an empty database.
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import type { Role } from '@shared/schemas';
import type { Database } from '../db';
import { hashPassword } from './passwords';

interface Scenario {
  organisation: { name: string };
  farms: { key: string; name: string; timeZone: string; location: string }[];
  people: { email: string; name: string; role: Role; password: string; farms: string[] }[];
}

export function readScenario(file = resolve(import.meta.dirname, '../../samples/demo/scenario.json')): Scenario {
  return JSON.parse(readFileSync(file, 'utf8')) as Scenario;
}

/** Loads the scenario; with onlyIfEmpty, does nothing when an organisation exists. Returns true when loaded. */
export async function loadDemoScenario(db: Database, opts: { onlyIfEmpty?: boolean } = {}): Promise<boolean> {
  const { Organisation, Farm, User, FarmAccess } = db.models;
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
  });
  return true;
}
