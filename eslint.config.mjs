// @ts-check
import withNuxt from './.nuxt/eslint.config.mjs'

export default withNuxt(
  {
    // native/ holds AssemblyScript (decorators, its own types), checked by its compiler.
    ignores: ['drizzle/**', '.data/**', 'tests/.artifacts/**', 'native/**'],
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
