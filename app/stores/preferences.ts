// Interface preferences that span pages (kept in this browser only).
import { defineStore } from 'pinia'

export type ThemeChoice = 'light' | 'dark' | 'system'

export const usePreferencesStore = defineStore('preferences', () => {
  const theme = ref<ThemeChoice>('system')

  function apply() {
    if (!import.meta.client) return
    const dark = theme.value === 'dark' || (theme.value === 'system' && window.matchMedia('(prefers-color-scheme: dark)').matches)
    document.documentElement.classList.toggle('dark', dark)
  }

  function load() {
    if (!import.meta.client) return
    const saved = localStorage.getItem('qf-theme')
    theme.value = saved === 'light' || saved === 'dark' ? saved : 'system'
    apply()
  }

  function setTheme(choice: ThemeChoice) {
    theme.value = choice
    if (import.meta.client) {
      if (choice === 'system') localStorage.removeItem('qf-theme')
      else localStorage.setItem('qf-theme', choice)
    }
    apply()
  }

  return { theme, load, setTheme }
})
