// Sign-up, sign-in, sign-out and profile changes.
import type { ProfileInput, SignInInput, SignUpInput } from '#shared/utils/validation'

export function useAuthActions() {
  const { reload } = useAccount()
  const afterChange = reload

  return {
    async signUp(input: SignUpInput) {
      await $fetch('/api/auth/sign-up', { method: 'POST', body: input })
      await afterChange()
    },
    async signIn(input: SignInInput) {
      await $fetch('/api/auth/sign-in', { method: 'POST', body: input })
      await afterChange()
    },
    async signOut() {
      await $fetch('/api/auth/sign-out', { method: 'POST' })
      clearNuxtData()
      await afterChange()
    },
    async updateProfile(input: ProfileInput) {
      await $fetch('/api/account', { method: 'PATCH', body: input })
      await afterChange()
    },
  }
}
