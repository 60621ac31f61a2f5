// Writes to companions and their members; each refreshes the data it changed.
import type { CompanionCreateInput, MemberAddInput } from '#shared/utils/validation'
import type { CompanionRole } from '#shared/types/roles'

export function useCompanionActions() {
  return {
    async create(input: CompanionCreateInput) {
      const { slug } = await $fetch('/api/companions', { method: 'POST', body: input })
      await refreshNuxtData('companions')
      return slug
    },
    async addMember(slug: string, input: MemberAddInput) {
      await $fetch(`/api/companions/${slug}/members`, { method: 'POST', body: input })
      await refreshNuxtData(`members-${slug}`)
    },
    async changeRole(slug: string, userId: string, role: CompanionRole) {
      await $fetch(`/api/companions/${slug}/members/${userId}`, { method: 'PATCH', body: { role } })
      await refreshNuxtData(`members-${slug}`)
    },
    async removeMember(slug: string, userId: string) {
      await $fetch(`/api/companions/${slug}/members/${userId}`, { method: 'DELETE' })
      await refreshNuxtData(`members-${slug}`)
    },
  }
}
