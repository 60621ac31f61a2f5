// Router parameter schemas shared by handlers.
import { z } from 'zod'

export const slugParams = z.object({ slug: slugSchema })
export const memberParams = z.object({ slug: slugSchema, userId: z.string().regex(/^[a-z0-9]{8,40}$/) })
export const userParams = z.object({ id: z.string().regex(/^[a-z0-9]{8,40}$/) })
