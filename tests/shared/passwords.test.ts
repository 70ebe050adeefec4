import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { PASSWORD_MIN_SCORE, passwordStrength } from '@shared/passwords';

const demo = JSON.parse(readFileSync(new URL('../../samples/demo/scenario.json', import.meta.url), 'utf8')) as {
  people: { email: string; name: string; password: string }[];
};

describe('passwordStrength', () => {
  it.each([
    ['password', 'one of the most used passwords'],
    ['qwertyuiop', 'one of the most used passwords'],
    ['password1234', 'close to a much-used password'],
    ['P@ssw0rd', 'close to a much-used password'],
    ['abcdefgh12', 'Runs such as abc'],
    ['monkey', 'Add another word or two'],
    ['aaaaaaaaaaaa', 'Repeated characters'],
  ])('refuses %s with our own wording', (password, why) => {
    const verdict = passwordStrength(password);
    expect(verdict.score).toBeLessThan(PASSWORD_MIN_SCORE);
    expect(verdict.acceptable).toBe(false);
    expect(verdict.message).toMatch(/^Too easy to guess\. /);
    expect(verdict.message).toContain(why);
  });

  it('refuses a password made of the person\'s own e-mail address or name', () => {
    expect(passwordStrength('olwenpryce', ['owner@tallowbrook.example', 'Olwen Pryce']).acceptable).toBe(false);
    expect(passwordStrength('tallowbrook', ['owner@tallowbrook.example']).message).toContain('your name or e-mail address');
  });

  it('accepts a few unrelated words', () => {
    expect(passwordStrength('kettle heron basalt plum')).toEqual({ score: 4, acceptable: true, message: null, problem: null });
  });

  it.each(demo.people.map((p) => [p.email, p.password, p.name]))('accepts the demo password of %s', (email, password, name) => {
    expect(passwordStrength(password, [email, name]).acceptable).toBe(true);
  });
});
