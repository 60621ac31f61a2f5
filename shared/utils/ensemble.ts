// What an author declares about an ensemble, validated by the upload form and by the server.
import { z } from 'zod'

const dimension = z.union([z.literal(1), z.literal(2), z.literal(3)], { message: 'The dimension must be 1, 2 or 3.' })

export const geometrySchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('free'), d: dimension }),
  z.object({ kind: z.literal('torus'), d: dimension, L: z.number({ message: 'Give the side L of the box.' }).positive('The side L of the box must be positive.').finite() }),
  z.object({ kind: z.literal('sphere') }),
], { message: 'Choose free space, the periodic box or the sphere.' })

export const kernelSchema = z.discriminatedUnion('name', [
  z.object({ name: z.literal('log') }),
  z.object({ name: z.literal('coulomb') }),
  z.object({ name: z.literal('riesz'), s: z.number({ message: 'Give the Riesz exponent s.' }).positive('The Riesz exponent s must be positive.').finite() }),
], { message: 'Choose the log, Coulomb or Riesz kernel.' })

export const conventionSchema = z.object({
  pairs: z.enum(['half', 'full'], { message: 'Say whether each pair is counted once or twice.' }),
  fieldScale: z.union([z.literal(1), z.literal('N/2'), z.literal('N')], { message: 'Say whether V is multiplied by 1, N/2 or N.' }),
  logSign: z.enum(['minus-log', 'plus-log'], { message: 'Say which sign the logarithm carries.' }),
  gibbs: z.enum(['beta', 'beta/2', 'beta N^(2/d-1)/2'], { message: 'Say which Gibbs weight the β refers to.' }),
})

export const canonicalConvention: z.infer<typeof conventionSchema> = { pairs: 'full', fieldScale: 'N', logSign: 'minus-log', gibbs: 'beta/2' }

const labelValue = z.union([z.string().max(200), z.number().finite()])

export const ensembleSettingSchema = z.object({
  name: z.string().trim().min(1, 'Give the ensemble a name, e.g. "β = 2, N = 400".').max(200, 'A name has at most 200 characters.'),
  description: z.string().trim().max(5000, 'A description has at most 5000 characters.').default(''),
  geometry: geometrySchema,
  kernel: kernelSchema,
  potential: z.string().trim().max(500, 'A potential has at most 500 characters.').nullable().default(null),
  beta: z.number().positive('β must be positive.').finite().nullable().default(null),
  convention: conventionSchema.default(canonicalConvention),
  labels: z.record(z.string().max(60), labelValue).default({}),
}).superRefine((value, ctx) => {
  const d = value.geometry.kind === 'sphere' ? 3 : value.geometry.d
  if (value.kernel.name === 'coulomb' && (value.geometry.kind === 'sphere' || d < 3)) {
    ctx.addIssue({ code: 'custom', path: ['kernel'], message: 'The Coulomb kernel |x|^(2−d) needs d = 3; use the log kernel in d = 1, 2 and on the sphere.' })
  }
  if (value.geometry.kind === 'free' && !value.potential) {
    ctx.addIssue({ code: 'custom', path: ['potential'], message: 'Points in free space need a confining potential V, e.g. r^2.' })
  }
  if (value.geometry.kind !== 'free' && value.potential) {
    ctx.addIssue({ code: 'custom', path: ['potential'], message: 'The sphere and the periodic box carry no external potential; leave it empty.' })
  }
})

export const ensembleUpdateSchema = z.object({
  name: ensembleSettingSchema.shape.name.optional(),
  description: ensembleSettingSchema.shape.description.optional(),
  potential: z.string().trim().max(500).nullable().optional(),
  beta: z.number().positive('β must be positive.').finite().nullable().optional(),
  convention: conventionSchema.optional(),
  labels: z.record(z.string().max(60), labelValue).optional(),
})

export type EnsembleSettingInput = z.infer<typeof ensembleSettingSchema>
export type ConventionInput = z.infer<typeof conventionSchema>
