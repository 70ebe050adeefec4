import { z } from 'zod';
import { ROLES, type Role, idSchema, text } from './common';
import { emailSchema } from './auth';

/** Body of POST /api/invitations: an owner invites a person. */
export const invitationSchema = z.object({
  email: emailSchema,
  name: text(120),
  role: z.enum(ROLES),
  farmIds: z.array(idSchema).max(500).default([]),
});
export type InvitationInput = z.infer<typeof invitationSchema>;

/** Body of PATCH /api/people/:id. */
export const personUpdateSchema = z
  .object({
    role: z.enum(ROLES),
    farmIds: z.array(idSchema).max(500),
    active: z.boolean(),
  })
  .partial();
export type PersonUpdateInput = z.infer<typeof personUpdateSchema>;

/** A person of the organisation as GET /api/people returns it. */
export interface Person {
  id: number;
  email: string;
  name: string;
  role: Role;
  active: boolean;
  /** True while the invitation has not been taken up (no password set yet). */
  invitationPending: boolean;
  farmIds: number[];
  lastSignInAt: string | null;
}
