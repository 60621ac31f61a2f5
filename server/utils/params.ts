// Router parameter schemas shared by handlers.
import { z } from 'zod'

export const slugParams = z.object({ slug: slugSchema })
export const memberParams = z.object({ slug: slugSchema, userId: z.string().regex(/^[a-z0-9]{8,40}$/) })
export const userParams = z.object({ id: z.string().regex(/^[a-z0-9]{8,40}$/) })
export const ensembleParams = z.object({ slug: slugSchema, id: z.coerce.number().int().positive() })
export const revisionParams = z.object({ slug: slugSchema, oid: z.string().regex(/^[0-9a-f]{40}$/) })
export const tokenParams = z.object({ slug: slugSchema, id: z.coerce.number().int().positive() })
export const computationParams = z.object({ slug: slugSchema, id: z.coerce.number().int().positive() })
export const figureParams = z.object({ slug: slugSchema, number: z.coerce.number().int().positive() })
export const invitationParams = z.object({ slug: slugSchema, id: z.coerce.number().int().positive() })
