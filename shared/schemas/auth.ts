import { z } from 'zod';
import { UNIT_SYSTEMS, type Role, type UnitSystem } from './common';

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
  })
  .partial();
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
  /** Farms this user may see (all of the organisation's for owners and managers). */
  farmIds: number[];
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


