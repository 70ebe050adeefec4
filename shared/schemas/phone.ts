// Mobile numbers for flag texts: typed in international form, checked against libphonenumber-js's
// mobile number metadata, stored in E.164.
import { parsePhoneNumberFromString } from 'libphonenumber-js/mobile';
import { z } from 'zod';

/** The E.164 form (+61491570156) of a mobile number typed in international form, or null when it is not one. */
export function mobileE164(input: string): string | null {
  const parsed = parsePhoneNumberFromString(input.trim());
  return parsed && parsed.isValid() ? parsed.number : null;
}

/** A person's mobile number: empty means none (null); anything else must be a mobile number, given with + and its country code. */
export const mobilePhoneSchema = z
  .string()
  .trim()
  .max(40, 'At most 40 characters')
  .transform((value, ctx) => {
    if (!value) return null;
    const e164 = mobileE164(value);
    if (!e164) ctx.addIssue({ code: 'custom', message: 'Enter a mobile number with + and the country code, such as +61 491 570 156' });
    return e164 ?? z.NEVER;
  });
