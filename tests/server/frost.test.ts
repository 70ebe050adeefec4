// Frost ahead against the local fake of the forecast service (server/weather/fake.ts): a frost in the
// forecast raises the flag on the farm's exposed tanks and cultures, a later forecast without it clears
// it, and a service that is down, too slow or answering nonsense changes no flag, logs a warning and
// marks the farm's forecast old. The 2 °C default threshold: see FROST_AHEAD_C in shared/flags
// (the US National Weather Service's frost-advisory range, recalled from memory).
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import type { FarmFrost, Flag } from '@shared/schemas';
import { startFakeWeather } from '../../server/weather/fake';
import { checkAllFarmsFrost, checkFarmFrost } from '../../server/services/frost';
import { drainTextQueue } from '../../server/services/flag-texts';
import { readFakeTexts } from '../../server/sms/outbox';
import { useTestApp } from '../support/db';
import { call, makeOrganisation, signedIn, type Agent, type OrgFixture } from '../support/fixtures';
import { makeTank } from '../support/tanks';

const weather = await startFakeWeather({ port: 0, slowMs: 5_000 });
const env = useTestApp({ WEATHER_URL: weather.url, WEATHER_TIMEOUT_SECONDS: '1' });
afterAll(() => weather.close());

async function scenario(name: string) {
  const res = await fetch(`${weather.url}/fake/scenario`, { method: 'PUT', body: JSON.stringify({ name }) });
  expect(res.status).toBe(200);
}

let org: OrgFixture;
let manager: Agent;
let farmId: number;
const tankIds: Record<string, number> = {};

beforeAll(async () => {
  org = await makeOrganisation(env, { farms: 1 });
  farmId = org.farmIds[0];
  manager = await signedIn(env, org.users.manager.email);
  await call(manager, 'patch', `/api/farms/${farmId}`, { latitude: 52.5, longitude: -8.1 }).expect(200);
  // Through the API, so each tank's "exposed to frost" starts as its contents say.
  const geometry = { shape: 'vertical-cylinder', diameterMm: 1000, heightMm: 1500 };
  for (const [code, contents] of [['FW-1', 'water'], ['FF-1', 'fertilizer'], ['FP-1', 'pest-solution'], ['FC-1', 'culture']] as const) {
    const res = await call(manager, 'post', '/api/tanks', { farmId, name: `Tank ${code}`, code, contents, geometry }).expect(201);
    tankIds[code] = res.body.id;
  }
  // A water tank in the pump house: its owner says it is not exposed.
  const sheltered = await makeTank(env, org, farmId, { code: 'FW-2', contents: 'water' });
  tankIds['FW-2'] = sheltered.id;
});

const frostFlags = async () => ((await manager.get(`/api/flags?farmId=${farmId}&kind=frost-ahead`).expect(200)).body as Flag[]).map((f) => f.subjectName).sort();
const farmOf = () => env.ctx.db.models.Farm.findByPk(farmId).then((f) => f!);
const frostOf = async () => (await manager.get(`/api/farms/${farmId}/frost`).expect(200)).body as FarmFrost;

describe('frost ahead', () => {
  it('starts water and fertilizer tanks exposed to frost, the others not', async () => {
    const tanks = (await manager.get(`/api/tanks?farmId=${farmId}`).expect(200)).body as { code: string; exposedToFrost: boolean }[];
    expect(Object.fromEntries(tanks.map((t) => [t.code, t.exposedToFrost]))).toEqual({ 'FW-1': true, 'FF-1': true, 'FP-1': false, 'FC-1': false, 'FW-2': false });
  });

  it('raises a flag on the exposed tanks and the culture when the forecast falls under the threshold, with the low and its time', async () => {
    await scenario('frost-tomorrow');
    const r = await checkFarmFrost(env.ctx, await farmOf());
    expect(r).toEqual({ changed: true, problem: null });
    expect(await frostFlags()).toEqual(['Tank FC-1 (FC-1)', 'Tank FF-1 (FF-1)', 'Tank FW-1 (FW-1)']);
    const flags = (await manager.get(`/api/flags?farmId=${farmId}&kind=frost-ahead`).expect(200)).body as Flag[];
    // samples/weather/frost-tomorrow.json: coldest hour -1.8 °C at 04:00 UTC tomorrow, inside the 48 hours at any time of day (tests/server/weather-fake.test.ts);
    // the same hour in Dublin, on UTC in winter, an hour later in summer time.
    expect(flags.every((f) => f.value === -1.8)).toBe(true);
    expect(flags.find((f) => f.subjectName.includes('FW-1'))!.message).toMatch(/air forecast to fall to -1\.8 °C around \w{3} \d{1,2} \w{3}, 0[45]:00 \(under 2 °C\)/);
    const frost = await frostOf();
    expect(frost.stale).toBe(false);
    expect(frost.frost?.lowC).toBe(-1.8);
    expect(frost.hours.length).toBeGreaterThanOrEqual(48);
    expect(frost.thresholdC).toBe(2);
  });

  it('keeps the flag as it was and logs a warning when the service is down, too slow or answers nonsense', async () => {
    const before = await frostFlags();
    const warn = vi.spyOn(env.ctx.logger, 'warn');
    for (const [fault, said] of [['down', /answered 503/], ['slow', /did not answer within 1 s/], ['garbage', /not an hourly forecast/]] as const) {
      await scenario(fault);
      const started = Date.now();
      const r = await checkFarmFrost(env.ctx, await farmOf());
      expect(r.changed).toBe(false);
      expect(r.problem).toMatch(said);
      if (fault === 'slow') expect(Date.now() - started).toBeLessThan(4_000);
      expect(await frostFlags()).toEqual(before);
      const frost = await frostOf();
      expect(frost.stale).toBe(true);
      expect(frost.problem).toMatch(said);
      // The last good forecast is still shown.
      expect(frost.frost?.lowC).toBe(-1.8);
    }
    expect(warn).toHaveBeenCalledTimes(3);
    expect(String(warn.mock.calls[0][1])).toContain('flags stay as they were');
    warn.mockRestore();
  });

  it('clears the flag when a later forecast no longer shows the frost', async () => {
    await scenario('mild');
    const result = await checkAllFarmsFrost(env.ctx);
    expect(result.failed).toBe(0);
    expect(await frostFlags()).toEqual([]);
    const cleared = ((await manager.get(`/api/flags?farmId=${farmId}&kind=frost-ahead&status=cleared`).expect(200)).body as Flag[]).length;
    expect(cleared).toBe(3);
    const frost = await frostOf();
    expect(frost).toMatchObject({ stale: false, problem: null, frost: null });
  });

  it('flags a tank set exposed by hand and follows a raised threshold', async () => {
    await call(manager, 'patch', `/api/tanks/${tankIds['FW-2']}`, { exposedToFrost: true }).expect(200);
    // The mild scenario's coldest hour in the next 48 h is 6 °C or more; a threshold of 8 °C meets it.
    await call(manager, 'patch', `/api/farms/${farmId}`, { frostAheadC: 8 }).expect(200);
    await checkFarmFrost(env.ctx, await farmOf());
    expect(await frostFlags()).toEqual(['Tank FC-1 (FC-1)', 'Tank FF-1 (FF-1)', 'Tank FW-1 (FW-1)', 'Tank FW-2 (FW-2)']);
    await call(manager, 'patch', `/api/farms/${farmId}`, { frostAheadC: 2 }).expect(200);
    await checkFarmFrost(env.ctx, await farmOf());
    expect(await frostFlags()).toEqual([]);
  });

  it('refuses a latitude without a longitude, naming the field, and a latitude out of range', async () => {
    const one = await call(manager, 'patch', `/api/farms/${farmId}`, { latitude: 10 }).expect(400);
    expect(one.body.error.field).toBe('longitude');
    const far = await call(manager, 'patch', `/api/farms/${farmId}`, { latitude: 91, longitude: 0 }).expect(400);
    expect(far.body.error.field).toBe('latitude');
    expect((await farmOf()).latitude).toBe(52.5);
  });

  it('clears the flags and fetches nothing once the farm has no place', async () => {
    await scenario('frost-tomorrow');
    await checkFarmFrost(env.ctx, await farmOf());
    expect((await frostFlags()).length).toBe(4);
    const asked = ((await (await fetch(`${weather.url}/fake/requests`)).json()) as { requests: unknown[] }).requests.length;
    await call(manager, 'patch', `/api/farms/${farmId}`, { latitude: null, longitude: null }).expect(200);
    await checkFarmFrost(env.ctx, await farmOf());
    expect(await frostFlags()).toEqual([]);
    expect(((await (await fetch(`${weather.url}/fake/requests`)).json()) as { requests: unknown[] }).requests.length).toBe(asked);
    expect(await frostOf()).toMatchObject({ located: false, stale: false, hours: [] });
  });
  it('texts a raised frost flag at once to those who chose a text per flag, once, and to nobody else', async () => {
    const other = await makeOrganisation(env, { farms: 1 });
    const [managerPhone, ownerPhone] = ['+61491570901', '+61491570902']; // the Australian range kept for drama (ACMA, recalled from memory)
    const otherManager = await signedIn(env, other.users.manager.email);
    const otherOwner = await signedIn(env, other.users.owner.email);
    await call(otherManager, 'patch', '/api/auth/me', { phone: managerPhone, flagTexts: 'immediate' }).expect(200);
    await call(otherOwner, 'patch', '/api/auth/me', { phone: ownerPhone, flagTexts: 'off' }).expect(200);
    await call(otherManager, 'patch', `/api/farms/${other.farmIds[0]}`, { latitude: 52.5, longitude: -8.1 }).expect(200);
    const geometry = { shape: 'vertical-cylinder', diameterMm: 1000, heightMm: 1500 };
    const tank = (await call(otherManager, 'post', '/api/tanks', { farmId: other.farmIds[0], name: 'Yard trough feed', code: 'YT-1', contents: 'water', geometry }).expect(201)).body as { id: number };
    const textsTo = (phone: string) => readFakeTexts(env.config.outboxDir).filter((t) => t.to === phone);
    const farm = async () => (await env.ctx.db.models.Farm.findByPk(other.farmIds[0]))!;

    await scenario('frost-tomorrow');
    expect((await checkFarmFrost(env.ctx, await farm())).changed).toBe(true);
    await drainTextQueue(env.ctx);
    const mine = textsTo(managerPhone);
    expect(mine).toHaveLength(1);
    expect(mine[0].body).toMatch(/^Brimstock Frost forecast, Farm 1 \w+: Yard trough feed: air forecast to fall to -1\.8 °C/);
    expect(mine[0].body.endsWith(`${env.config.publicUrl}/tanks/${tank.id}`)).toBe(true);
    expect(mine[0].body.length).toBeLessThanOrEqual(160);
    expect(textsTo(ownerPhone)).toHaveLength(0);

    // The next check finds the same frost: the flag stays, no second text.
    expect((await checkFarmFrost(env.ctx, await farm())).changed).toBe(false);
    await drainTextQueue(env.ctx);
    expect(textsTo(managerPhone)).toHaveLength(1);
  });
});
