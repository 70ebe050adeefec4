import { describe, expect, it } from 'vitest';
import request from 'supertest';
import { useTestApp } from '../support/db';
import { PASSWORD, anonymousAgent, call, makeOrganisation, signedIn, type Agent } from '../support/fixtures';
import { waitForMail } from '../support/mail';

const env = useTestApp();

async function signInWith(email: string, acceptLanguage: string): Promise<{ agent: Agent; language: unknown }> {
  const agent = request.agent(env.app) as Agent;
  agent.csrf = (await agent.get('/api/auth/session').expect(200)).body.csrfToken;
  const res = await agent.post('/api/auth/sign-in').set('x-csrf-token', agent.csrf).set('Accept-Language', acceptLanguage).send({ email, password: PASSWORD }).expect(200);
  agent.csrf = res.body.csrfToken;
  return { agent, language: res.body.user.language };
}

describe("a person's language", () => {
  it('is null until chosen when the sign-in names no browser language', async () => {
    const org = await makeOrganisation(env);
    const agent = await signedIn(env, org.users.worker.email);
    expect((await agent.get('/api/auth/me').expect(200)).body.language).toBeNull();
  });

  it("takes the browser's language at the first sign-in and keeps it at the next", async () => {
    const org = await makeOrganisation(env);
    expect((await signInWith(org.users.worker.email, 'es-MX,es;q=0.9,en;q=0.8')).language).toBe('es');
    expect((await signInWith(org.users.worker.email, 'fr-FR,fr;q=0.9')).language).toBe('es');
  });

  it('takes English from a browser asking only for languages Brimstock does not speak', async () => {
    const org = await makeOrganisation(env);
    expect((await signInWith(org.users.buyer.email, 'de-DE,de;q=0.9')).language).toBe('en');
  });

  it('is chosen on the Profile and then stays through later sign-ins', async () => {
    const org = await makeOrganisation(env);
    const { agent } = await signInWith(org.users.manager.email, 'en-GB');
    const res = await call(agent, 'patch', '/api/auth/me', { language: 'fr' }).expect(200);
    expect(res.body.language).toBe('fr');
    expect((await signInWith(org.users.manager.email, 'es')).language).toBe('fr');
  });

  it('refuses a language Brimstock does not speak, naming the field, and keeps the stored one', async () => {
    const org = await makeOrganisation(env);
    const { agent } = await signInWith(org.users.owner.email, 'es');
    const res = await call(agent, 'patch', '/api/auth/me', { language: 'de' }).expect(400);
    expect(res.body.error.field).toBe('language');
    expect((await agent.get('/api/auth/me').expect(200)).body.language).toBe('es');
  });

  it("mails a reset link in the person's language and an invitation in the inviter's", async () => {
    const org = await makeOrganisation(env);
    const { agent: owner } = await signInWith(org.users.owner.email, 'fr-FR');
    await signInWith(org.users.buyer.email, 'es-ES');
    const anonymous = await anonymousAgent(env);
    await call(anonymous, 'post', '/api/auth/password-reset', { email: org.users.buyer.email }).expect(202);
    const reset = await waitForMail(env.config.outboxDir, org.users.buyer.email);
    expect(reset.subject).toBe('Elija una nueva contraseña de Brimstock');
    expect(reset.text).toContain('Abra este enlace para elegir su contraseña');

    const email = `newcomer-${org.organisationId}@test.example`;
    await call(owner, 'post', '/api/invitations', { email, name: 'Noa Reyes', role: 'worker', farmIds: [org.farmIds[0]] }).expect(201);
    const invite = await waitForMail(env.config.outboxDir, email);
    expect(invite.subject).toMatch(/^Vous êtes invité à rejoindre .+ sur Brimstock$/);
    expect(invite.text).toContain('en tant que ouvrier');
  });
});
