// Input of the page routes, shared by the editor and the handlers.
import { z } from 'zod'
import { PAGE_TEXT_LIMIT } from './render'

const pageText = z.string({ message: 'Send the page text.' })
  .max(PAGE_TEXT_LIMIT, `The page has at most ${PAGE_TEXT_LIMIT.toLocaleString('en')} characters.`)

export const pageSaveSchema = z.object({
  text: pageText,
  message: z.string().trim().max(500, 'A revision message has at most 500 characters.').optional(),
  // The SHA-256 of the text the writer started from (GET page gives it as textHash): a save over
  // someone else's newer text is refused instead of overwriting it.
  basedOn: z.string().regex(/^[0-9a-f]{64}$/, 'basedOn is the textHash the page was loaded with.').optional(),
})

export const pagePreviewSchema = z.object({ text: pageText })

export type PageSaveInput = z.infer<typeof pageSaveSchema>
