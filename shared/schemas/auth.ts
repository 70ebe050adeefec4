import { z } from 'zod';
import { UNIT_SYSTEMS, type Role, type UnitSystem } from './common';
import { mobilePhoneSchema } from './phone';
import { LANGUAGES, type Language } from '../i18n/languages';

/** Minimum password length the product accepts. */
export const PASSWORD_MIN_LENGTH = 8;

/** E-mail address, trimmed and lower-cased. */
export const emailSchema = z.string().trim().toLowerCase().pipe(z.email('Enter a valid e-mail address').max(254));

/** A new password: at least 8 characters, at most 200. */
export const passwordSchema = z
  .string()
  .min(PASSWORD_MIN_LENGTH, `At least ${PASSWORD_MIN_LENGTH} characters`)
  .max(200, 'At most 200 characters');

/** Body of POST /api/auth/sign-in. */
export const signInSchema = z.object({
  email: emailSchema,
  password: z.string().min(1, 'Required').max(200),
});
export type SignInInput = z.infer<typeof signInSchema>;

/** Body of POST /api/auth/set-password (invitation or reset link). */
export const setPasswordSchema = z.object({
  token: z.string().min(20).max(200),
  password: passwordSchema,
  name: z.string().trim().min(1).max(120).optional(),
});
export type SetPasswordInput = z.infer<typeof setPasswordSchema>;

/** Body of POST /api/setup/first-owner: the set-up link's token, the new organisation and its owner. */
export const firstOwnerSchema = z.object({
  token: z.string().min(20).max(200),
  organisationName: z.string().trim().min(1, 'Required').max(160),
  name: z.string().trim().min(1, 'Required').max(120),
  email: emailSchema,
  password: passwordSchema,
});
export type FirstOwnerInput = z.infer<typeof firstOwnerSchema>;

/** GET /api/setup: whether this server still needs its first owner (no organisation exists yet). */
export interface SetupState {
  firstOwnerNeeded: boolean;
}

/** Body of POST /api/auth/password-reset. */
export const passwordResetSchema = z.object({ email: emailSchema });

/** How a person hears of flags by mail: one mail per new flag, a daily summary, or none. */
export const FLAG_MAIL_CHOICES = ['immediate', 'digest', 'off'] as const;
export type FlagMailChoice = (typeof FLAG_MAIL_CHOICES)[number];

/** Body of PATCH /api/auth/me: the user's own preferences. */
export const profileSchema = z
  .object({
    name: z.string().trim().min(1, 'Required').max(120),
    unitSystem: z.enum(UNIT_SYSTEMS),
    flagMail: z.enum(FLAG_MAIL_CHOICES),
    phone: mobilePhoneSchema,
    flagTexts: z.enum(FLAG_MAIL_CHOICES),
    language: z.enum(LANGUAGES),
  })
  .partial()
  .refine((p) => p.phone !== null || !p.flagTexts || p.flagTexts === 'off', { message: 'Texts need a mobile number', path: ['phone'] });
export type ProfileInput = z.infer<typeof profileSchema>;

/** The signed-in user as the API returns it. */
export interface SessionUser {
  id: number;
  email: string;
  name: string;
  role: Role;
  organisationId: number;
  organisationName: string;
  /** The organisation's short code, the start of its order numbers ("TB"). */
  organisationCode: string;
  /** ISO 4217 code of the organisation's money figures ("EUR"). */
  currency: string;
  unitSystem: UnitSystem;
  flagMail: FlagMailChoice;
  /** Mobile number in E.164, or null. */
  phone: string | null;
  /** How flags reach this person by text: the same choices as by mail. */
  flagTexts: FlagMailChoice;
  /** ISO 8601 instant a STOP reply from the number turned texts off, or null. */
  textsStoppedAt: string | null;
  /** The person's language for screens, mails, texts and PDFs; null until chosen (the browser's language is used). */
  language: Language | null;
  /** Farms this user may see (all of the organisation's for owners and managers). */
  farmIds: number[];
}

/** A text about flags that could not be delivered after every attempt (GET /api/auth/me/text-failures). */
export interface TextFailure {
  id: number;
  to: string;
  body: string;
  attempts: number;
  /** The service's last refusal, in its words. */
  reason: string;
  /** ISO 8601 instant of the last attempt. */
  at: string;
}

/** GET /api/auth/session: who is signed in (or null) and the CSRF token for writes. */
export interface SessionState {
  user: SessionUser | null;
  csrfToken: string;
}

/** GET /api/auth/tokens/:token: what an invitation or reset link is for. */
export interface TokenInfo {
  purpose: 'invite' | 'reset';
  email: string;
  name: string;
}


