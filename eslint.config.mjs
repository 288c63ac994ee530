// @ts-check
import withNuxt from './.nuxt/eslint.config.mjs'

export default withNuxt(
  { ignores: ['drizzle/**', '.data/**', 'tests/artefacts/**', '.output*/**'] },
  // API tests read JSON bodies of many shapes; typing each one would add nothing the assertions don't check
  { files: ['tests/**'], rules: { '@typescript-eslint/no-explicit-any': 'off' } },
)
