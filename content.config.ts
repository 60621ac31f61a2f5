import { defineCollection, defineContentConfig, z } from '@nuxt/content'

export default defineContentConfig({
  collections: {
    methods: defineCollection({
      type: 'page',
      source: 'methods/**/*.md',
      schema: z.object({
        // The id of the catalogue quantity the page explains (cli/catalogue.ts), when it explains one.
        quantity: z.string().optional(),
      }),
    }),
    guide: defineCollection({
      type: 'page',
      source: 'guide/**/*.md',
      schema: z.object({
        // Order of the page in the guide's index.
        order: z.number().optional(),
      }),
    }),
  },
})
