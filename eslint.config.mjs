// @ts-check
import withNuxt from './.nuxt/eslint.config.mjs'

export default withNuxt(
  {
    ignores: ['drizzle/**', '.data/**', 'tests/.artifacts/**'],
  },
  {
    // Quadrature and special-function tables are written with the digits their sources print.
    files: ['shared/physics/**/*.ts'],
    rules: { 'no-loss-of-precision': 'off' },
  },
  {
    rules: {
      '@typescript-eslint/no-explicit-any': 'error',
      'vue/multi-word-component-names': 'off',
    },
  },
)
