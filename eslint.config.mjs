// @nuxt/eslint-config's flat config for Nuxt 4 projects, with the house style.
import { createConfigForNuxt } from '@nuxt/eslint-config/flat'

export default createConfigForNuxt({
  features: { stylistic: { indent: 2, quotes: 'single', semi: false } },
  dirs: { src: ['./app'] },
}).append({
  ignores: ['.output/**', '.nuxt/**', '.nuxt-vitest/**', '.nuxt-build/**', '.data/**', 'test-output/**', 'node_modules/**'],
}).append({
  rules: {
    'vue/multi-word-component-names': 'off',
    'vue/max-attributes-per-line': 'off',
    'vue/singleline-html-element-content-newline': 'off',
    '@typescript-eslint/no-non-null-assertion': 'off',
    '@stylistic/member-delimiter-style': ['error', {
      multiline: { delimiter: 'none' },
      singleline: { delimiter: 'semi', requireLast: false },
    }],
  },
}).append({
  files: ['tests/**'],
  rules: { '@typescript-eslint/no-explicit-any': 'off' },
})
