// Validation schemas of the review course, invitations and account e-mail links.
import { z } from 'zod'
import { companionRoleSchema, emailSchema, passwordSchema } from './validation'

const states = ['draft', 'in_review', 'revising', 'accepted', 'published', 'withdrawn'] as const

export const reasonSchema = z.string().trim()
  .min(3, 'Give a reason: members read it in the message and in the audit trail.')
  .max(2000, 'A reason has at most 2000 characters.')

export const moveSchema = z.object({
  to: z.enum(states, { message: 'Choose the state to move to.' }),
  reason: reasonSchema,
  publishRemarks: z.boolean().optional(),
})

export const reviewSettingsSchema = z.object({
  identitiesOpen: z.boolean().optional(),
  remarksPublic: z.boolean().optional(),
  reason: reasonSchema,
}).refine(v => v.identitiesOpen !== undefined || v.remarksPublic !== undefined, { message: 'Change at least one setting.', path: ['identitiesOpen'] })

export const invitationCreateSchema = z.object({
  email: emailSchema,
  role: companionRoleSchema,
  message: z.string().trim().max(2000, 'A message has at most 2000 characters.').default(''),
})

/** A link token from an e-mail: 43 base64url characters (32 random bytes). */
export const linkTokenSchema = z.string().trim().regex(/^[\w-]{43}$/, 'That link is not complete; copy the whole address from the message.')

export const invitationTokenParams = z.object({ token: linkTokenSchema })

export const passwordResetRequestSchema = z.object({ email: emailSchema })

export const passwordResetSchema = z.object({
  token: linkTokenSchema,
  password: passwordSchema,
})

export const verifyEmailSchema = z.object({ token: linkTokenSchema })

export type MoveInput = z.infer<typeof moveSchema>
export type InvitationCreateInput = z.infer<typeof invitationCreateSchema>
