import { z } from 'zod';
import { ORGANISATION_CODE_PATTERN } from '../inventory/order-number';

/** ISO 4217 codes this JavaScript engine can format (Intl.supportedValuesOf), read once. */
const CURRENCIES: ReadonlySet<string> = new Set(Intl.supportedValuesOf('currency'));

/** Whether `code` is an ISO 4217 currency code that Intl.NumberFormat formats ("EUR", "NZD"). */
export function isCurrencyCode(code: string): boolean {
  return /^[A-Z]{3}$/.test(code) && CURRENCIES.has(code);
}

/** An ISO 4217 currency code, upper-cased ("eur" is read as "EUR"). */
export const currencySchema = z
  .string({ error: 'must be a currency code such as EUR' })
  .trim()
  .toUpperCase()
  .refine(isCurrencyCode, { message: 'must be an ISO 4217 currency code such as EUR, GBP or NZD' });

/** An organisation's short code: 2 to 4 letters, upper-cased, that starts every order number. */
export const organisationCodeSchema = z
  .string({ error: 'must be 2 to 4 letters' })
  .trim()
  .toUpperCase()
  .regex(ORGANISATION_CODE_PATTERN, 'must be 2 to 4 letters A–Z, such as TB');

/** Body of PATCH /api/organisation (owners): the code and the currency of every money figure. */
export const organisationSettingsSchema = z
  .object({ code: organisationCodeSchema, currency: currencySchema })
  .partial()
  .refine((v) => v.code !== undefined || v.currency !== undefined, { message: 'change the code or the currency' });
export type OrganisationSettingsInput = z.infer<typeof organisationSettingsSchema>;

/** GET /api/organisation: the signed-in person's organisation. */
export interface OrganisationSettings {
  id: number;
  name: string;
  code: string;
  currency: string;
  /** The number the next order gets this year (by the first farm's clock), e.g. "TB-26-004". */
  nextOrderNumber: string;
}
