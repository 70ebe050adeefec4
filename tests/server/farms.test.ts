import { describe, expect, it } from 'vitest';
import { useTestApp } from '../support/db';
import { call, makeOrganisation, signedIn } from '../support/fixtures';

const env = useTestApp();

describe('farms API', () => {
  it('creates a farm and shows it to managers but not to workers without access', async () => {
    const org = await makeOrganisation(env);
    const manager = await signedIn(env, org.users.manager.email);
    const created = await call(manager, 'post', '/api/farms', { name: 'Gorse Hollow', timeZone: 'Europe/Lisbon', location: 'Lane end' }).expect(201);
    expect(created.body).toMatchObject({ name: 'Gorse Hollow', timeZone: 'Europe/Lisbon', archivedAt: null });
    const worker = await signedIn(env, org.users.worker.email);
    await worker.get(`/api/farms/${created.body.id}`).expect(403);
  });

  it('names the field when the time zone is unknown and stores nothing', async () => {
    const org = await makeOrganisation(env);
    const owner = await signedIn(env, org.users.owner.email);
    const res = await call(owner, 'post', '/api/farms', { name: 'Nowhere', timeZone: 'Mars/Olympus' }).expect(400);
    expect(res.body.error).toMatchObject({ field: 'timeZone' });
    expect(await env.ctx.db.models.Farm.count({ where: { name: 'Nowhere' } })).toBe(0);
  });

  it('archives and restores a farm; archived farms are listed only when asked', async () => {
    const org = await makeOrganisation(env);
    const owner = await signedIn(env, org.users.owner.email);
    const id = org.farmIds[1];
    const archived = await call(owner, 'patch', `/api/farms/${id}`, { archived: true }).expect(200);
    expect(archived.body.archivedAt).not.toBeNull();
    const active = await owner.get('/api/farms').expect(200);
    expect(active.body.map((f: { id: number }) => f.id)).not.toContain(id);
    const all = await owner.get('/api/farms?includeArchived=true').expect(200);
    expect(all.body.map((f: { id: number }) => f.id)).toContain(id);
    const restored = await call(owner, 'patch', `/api/farms/${id}`, { archived: false }).expect(200);
    expect(restored.body.archivedAt).toBeNull();
  });

  it('answers 404 for a malformed id', async () => {
    const org = await makeOrganisation(env);
    const owner = await signedIn(env, org.users.owner.email);
    await owner.get('/api/farms/abc').expect(404);
  });
});

describe('people API', () => {
  it('changes farm access of a worker and refuses farms of another organisation', async () => {
    const org = await makeOrganisation(env);
    const other = await makeOrganisation(env, { farms: 1 });
    const owner = await signedIn(env, org.users.owner.email);
    const res = await call(owner, 'patch', `/api/people/${org.users.worker.id}`, { farmIds: org.farmIds }).expect(200);
    expect(res.body.farmIds).toEqual(org.farmIds);
    const bad = await call(owner, 'patch', `/api/people/${org.users.worker.id}`, { farmIds: [other.farmIds[0]] }).expect(422);
    expect(bad.body.error.field).toBe('farmIds');
    const worker = await signedIn(env, org.users.worker.email);
    const me = await worker.get('/api/auth/me').expect(200);
    expect(me.body.farmIds).toEqual(org.farmIds);
  });

  it('lists the organisation\'s people with pending invitations marked', async () => {
    const org = await makeOrganisation(env);
    const owner = await signedIn(env, org.users.owner.email);
    await call(owner, 'post', '/api/invitations', { email: `pending-${Date.now()}@test.example`, name: 'Pending Person', role: 'buyer', farmIds: [] }).expect(201);
    const res = await owner.get('/api/people').expect(200);
    expect(res.body).toHaveLength(5);
    expect(res.body.find((p: { name: string }) => p.name === 'Pending Person').invitationPending).toBe(true);
  });
});

describe('PATCH /api/farms/:id', () => {
  it('keeps the location when only the name changes', async () => {
    const org = await makeOrganisation(env);
    const owner = await signedIn(env, org.users.owner.email);
    await call(owner, 'patch', `/api/farms/${org.farmIds[0]}`, { location: 'North lane' }).expect(200);
    const res = await call(owner, 'patch', `/api/farms/${org.farmIds[0]}`, { name: 'Renamed' }).expect(200);
    expect(res.body).toMatchObject({ name: 'Renamed', location: 'North lane' });
  });
});
