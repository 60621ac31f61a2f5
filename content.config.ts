import { defineCollection, defineContentConfig } from '@nuxt/content'

export default defineContentConfig({
  collections: {
    methods: defineCollection({
      type: 'page',
      source: 'methods/**/*.md',
    }),
    guide: defineCollection({
      type: 'page',
      source: 'guide/**/*.md',
    }),
  },
})
