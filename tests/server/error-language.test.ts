import { describe, expect, it } from 'vitest';
import request from 'supertest';
import { useTestApp } from '../support/db';
import { PASSWORD, call, makeOrganisation, type Agent } from '../support/fixtures';

const env = useTestApp();

async function signedInAs(email: string, acceptLanguage: string): Promise<Agent> {
  const agent = request.agent(env.app) as Agent;
  agent.csrf = (await agent.get('/api/auth/session').expect(200)).body.csrfToken;
  const res = await agent.post('/api/auth/sign-in').set('x-csrf-token', agent.csrf).set('Accept-Language', acceptLanguage).send({ email, password: PASSWORD }).expect(200);
  agent.csrf = res.body.csrfToken;
  return agent;
}

describe('API error messages', () => {
  it("refuse a sign-in in the browser's language, and in English without one", async () => {
    const org = await makeOrganisation(env);
    const agent = request.agent(env.app);
    const csrf = (await agent.get('/api/auth/session').expect(200)).body.csrfToken;
    const es = await agent.post('/api/auth/sign-in').set('x-csrf-token', csrf).set('Accept-Language', 'es-ES,es;q=0.9').send({ email: org.users.worker.email, password: 'wrong-password-1' }).expect(401);
    expect(es.body.error).toEqual({ code: 'invalid_credentials', message: 'El correo o la contraseña no son correctos' });
    const en = await agent.post('/api/auth/sign-in').set('x-csrf-token', csrf).send({ email: org.users.worker.email, password: 'wrong-password-1' }).expect(401);
    expect(en.body.error.message).toBe('E-mail or password is wrong');
  });

  it("name the field of a failed check in the person's own language, whatever the browser asks", async () => {
    const org = await makeOrganisation(env);
    const agent = await signedInAs(org.users.manager.email, 'fr-FR');
    const res = await call(agent, 'patch', '/api/auth/me', { name: '' }).set('Accept-Language', 'en-US').expect(400);
    expect(res.body.error).toEqual({ code: 'invalid_input', field: 'name', message: 'name: Obligatoire' });
    const phone = await call(agent, 'patch', '/api/auth/me', { phone: '+1 555', flagTexts: 'immediate' }).expect(400);
    expect(phone.body.error.field).toBe('phone');
    expect(phone.body.error.message).toBe('phone: Saisissez un numéro de mobile avec + et l’indicatif du pays, par exemple +61 491 570 156');
  });

  it("say not found, not allowed and zod's own checks in Spanish", async () => {
    const org = await makeOrganisation(env);
    const worker = await signedInAs(org.users.worker.email, 'es');
    expect((await worker.get('/api/tanks/999999').expect(404)).body.error.message).toBe('No se encontró el tanque');
    expect((await worker.get(`/api/farms/${org.farmIds[1]}`)).body.error.message).toBe('No tiene acceso a esta finca');
    // unitSystem has no message of its own in the schema: zod's enum issue becomes the catalogue's.
    const res = await call(worker, 'patch', '/api/auth/me', { unitSystem: 'imperial' }).expect(400);
    expect(res.body.error.message).toBe('unitSystem: Elija una de las opciones');
  });
});
