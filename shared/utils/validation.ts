// Validation schemas shared by forms (client) and handlers (server).
import { z } from 'zod'
import { researcherIdProblem } from './orcid'

export const emailSchema = z.string().trim().toLowerCase()
  .min(3, 'Enter an e-mail address.')
  .max(254, 'An e-mail address has at most 254 characters.')
  .email('Enter an e-mail address such as name@institute.example.')

export const passwordSchema = z.string()
  .min(10, 'A password needs at least 10 characters.')
  .max(200, 'A password has at most 200 characters.')

export const displayNameSchema = z.string().trim()
  .min(1, 'Enter the name others should see.')
  .max(120, 'A name has at most 120 characters.')

export const signUpSchema = z.object({
  email: emailSchema,
  password: passwordSchema,
  displayName: displayNameSchema,
})

export const signInSchema = z.object({
  email: emailSchema,
  password: z.string().min(1, 'Enter your password.').max(200, 'A password has at most 200 characters.'),
})

export const profileSchema = z.object({
  displayName: displayNameSchema,
  affiliation: z.string().trim().max(200, 'An affiliation has at most 200 characters.'),
  orcid: z.string().trim().toUpperCase().max(19)
    .refine(v => v === '' || researcherIdProblem(v) === null, { message: 'That researcher identifier is not valid: use the form 0000-0000-0000-000X with a correct check digit.' }),
  // How remark notifications reach the account; left as it is when not given.
  remarkMail: z.enum(['immediate', 'daily', 'none'], { message: 'Choose each message at once, a daily digest, or none.' }).optional(),
})

export const slugSchema = z.string().trim().toLowerCase()
  .min(3, 'A short name needs at least 3 characters.')
  .max(64, 'A short name has at most 64 characters.')
  .regex(/^[a-z0-9]+(?:-[a-z0-9]+)*$/, 'Use lower-case letters, digits and single hyphens (e.g. plasma-next-order).')

export const companionCreateSchema = z.object({
  title: z.string().trim().min(3, 'A title needs at least 3 characters.').max(300, 'A title has at most 300 characters.'),
  slug: slugSchema,
  abstract: z.string().trim().max(5000, 'An abstract has at most 5000 characters.').default(''),
  manuscriptRef: z.string().trim().max(120, 'A manuscript identifier has at most 120 characters.').default(''),
})

export const companionUpdateSchema = companionCreateSchema.omit({ slug: true }).partial()

export const companionRoleSchema = z.enum(['reader', 'reviewer', 'author', 'editor'], { message: 'Choose a role: reader, reviewer, author or editor.' })

export const memberAddSchema = z.object({
  email: emailSchema,
  role: companionRoleSchema,
})

export const memberUpdateSchema = z.object({
  role: companionRoleSchema,
})

export const siteRoleUpdateSchema = z.object({
  siteRole: z.enum(['admin', 'member'], { message: 'Choose a site role: admin or member.' }),
})

export type SignUpInput = z.infer<typeof signUpSchema>
export type SignInInput = z.infer<typeof signInSchema>
export type ProfileInput = z.infer<typeof profileSchema>
export type CompanionCreateInput = z.infer<typeof companionCreateSchema>
export type MemberAddInput = z.infer<typeof memberAddSchema>

/** Field-by-field messages of a zod error, for forms. */
export function fieldErrors(error: z.ZodError): Record<string, string> {
  const out: Record<string, string> = {}
  for (const issue of error.issues) {
    const key = issue.path.join('.') || 'form'
    if (!(key in out)) out[key] = issue.message
  }
  return out
}

export const tokenCreateSchema = z.object({
  name: z.string().trim().min(1, 'Name the token after the pipeline that uses it.').max(120, 'A name has at most 120 characters.'),
  scopes: z.array(z.enum(['ensembles:read', 'ensembles:write'], { message: 'Scopes are ensembles:read and ensembles:write.' }))
    .min(1, 'Choose at least one scope.').max(2),
})

export const computationCreateSchema = z.object({
  name: z.string().trim().min(1, 'Name the computation, e.g. "next-order energy, all N".').max(200, 'A name has at most 200 characters.'),
  quantity: z.string().trim().min(1, 'Choose a quantity.').max(60),
  ensembleIds: z.array(z.number().int().positive()).min(1, 'Choose at least one ensemble.').max(50, 'At most 50 ensembles in one computation.'),
  parameters: z.record(z.string().max(40), z.union([z.string().max(500), z.number(), z.boolean(), z.null()])).default({}),
})

export const figureCreateSchema = z.object({
  title: z.string().trim().min(1, 'Give the figure a title.').max(300, 'A title has at most 300 characters.'),
  caption: z.string().trim().max(5000, 'A caption has at most 5000 characters.').default(''),
  template: z.string().trim().min(1, 'Choose a template.').max(60),
  computationIds: z.array(z.number().int().positive()).min(1, 'Choose at least one computation.').max(20),
  options: z.record(z.string().max(40), z.union([z.string().max(200), z.number(), z.boolean()])).default({}),
  /** With template 'custom': a Vega-Lite spec whose data sources are named computation-<id>. */
  spec: z.record(z.string(), z.unknown()).optional(),
})
