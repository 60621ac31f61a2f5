// Input of the page routes, shared by the editor and the handlers.
import { z } from 'zod'
import { PAGE_TEXT_LIMIT } from './render'

const pageText = z.string({ message: 'Send the page text.' })
  .max(PAGE_TEXT_LIMIT, `The page has at most ${PAGE_TEXT_LIMIT.toLocaleString('en')} characters.`)

export const pageSaveSchema = z.object({
  text: pageText,
  message: z.string().trim().max(500, 'A revision message has at most 500 characters.').optional(),
})

export const pagePreviewSchema = z.object({ text: pageText })

export type PageSaveInput = z.infer<typeof pageSaveSchema>
