import { describe, expect, it } from 'vitest';
import { farmCreateSchema, invitationSchema } from '@shared/schemas';
import { ApiError } from '@/api/http';
import { useFormErrors, withoutFieldPrefix } from '@/composables/useFormErrors';
import { linkify } from '@/utils/linkify';
import { timeZoneOptions } from '@/utils/timeZones';

describe('linkify', () => {
  it('turns a set-password link into a link part and keeps the text around it', () => {
    const parts = linkify('Hello,\nopen http://127.0.0.1:5173/set-password?token=abc123 to join.');
    expect(parts).toEqual([
      { text: 'Hello,\nopen ' },
      { text: 'http://127.0.0.1:5173/set-password?token=abc123', href: 'http://127.0.0.1:5173/set-password?token=abc123' },
      { text: ' to join.' },
    ]);
  });

  it.each([
    ['See https://brim.test/a.', 'https://brim.test/a', '.'],
    ['(https://brim.test/b)', 'https://brim.test/b', ')'],
    ['Go: https://brim.test/c?x=1&y=2, then', 'https://brim.test/c?x=1&y=2', ', then'],
  ])('leaves sentence punctuation out of the link in %j', (text, href, after) => {
    const parts = linkify(text);
    const link = parts.find((p) => p.href);
    expect(link?.href).toBe(href);
    expect(parts.at(-1)?.text.startsWith(after)).toBe(true);
  });

  it('returns one text part when there is no link, and nothing for empty text', () => {
    expect(linkify('No links here')).toEqual([{ text: 'No links here' }]);
    expect(linkify('')).toEqual([]);
  });

  it('does not link other schemes', () => {
    expect(linkify('javascript:alert(1)').some((p) => p.href)).toBe(false);
  });
});

describe('useFormErrors', () => {
  it('puts zod messages under the fields the form shows', () => {
    const form = useFormErrors({ fields: ['email', 'name', 'role', 'farmIds'] });

    const result = form.validate(invitationSchema, { email: 'nope', name: ' ', role: 'captain', farmIds: [3, -1] });

    expect(result).toBeNull();
    expect(Object.keys(form.errors.value).sort()).toEqual(['email', 'farmIds', 'name', 'role']);
    expect(form.errors.value.name).toBe('Required');
    expect(form.formError.value).toBeNull();
  });

  it('returns the parsed data and clears old errors when the input is valid', () => {
    const form = useFormErrors({ fields: ['name', 'timeZone', 'location'] });
    form.validate(farmCreateSchema, { name: '', timeZone: 'Nowhere/Else' });

    const data = form.validate(farmCreateSchema, { name: ' Creek site ', timeZone: 'Europe/Lisbon' });

    expect(data).toEqual({ name: 'Creek site', timeZone: 'Europe/Lisbon', location: '', staleAfterDays: 3, coldCultureC: 18, frostRiskC: 2, latitude: null, longitude: null, frostAheadC: 2 });
    expect(form.errors.value).toEqual({});
  });

  it('puts a server error with a known field under that field, without the "field: " prefix', () => {
    const form = useFormErrors({ fields: ['email'] });

    const placed = form.showServerError(new ApiError(409, 'email_taken', 'email: someone with this e-mail address already has an account', 'email'));

    expect(placed).toBe(true);
    expect(form.errors.value.email).toBe('someone with this e-mail address already has an account');
  });

  it('maps a code to a field when the server sends no field', () => {
    const form = useFormErrors({ fields: ['role'], codeFields: { own_account: 'role' } });

    form.showServerError(new ApiError(409, 'own_account', 'You cannot demote or deactivate your own account'));

    expect(form.errors.value.role).toBe('You cannot demote or deactivate your own account');
  });

  it('shows other errors for the whole form', () => {
    const form = useFormErrors({ fields: ['email'] });

    const placed = form.showServerError(new ApiError(429, 'rate_limited', 'Too many attempts'));

    expect(placed).toBe(false);
    expect(form.formError.value).toBe('Too many attempts');
  });

  it.each([
    ['email: taken', 'email', 'taken'],
    ['name is too long', 'name', 'name is too long'],
  ])('withoutFieldPrefix(%j, %j) is %j', (message, field, expected) => {
    expect(withoutFieldPrefix(message, field)).toBe(expected);
  });
});

describe('timeZoneOptions', () => {
  it('lists the runtime time zones and adds UTC and a stored zone the list lacks', () => {
    const zones = timeZoneOptions('Etc/GMT+3');
    expect(zones).toContain('Europe/Lisbon');
    expect(zones).toContain('UTC');
    expect(zones).toContain('Etc/GMT+3');
    expect(new Set(zones).size).toBe(zones.length);
  });
});
