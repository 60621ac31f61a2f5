// Writes to remarks: open one, reply, settle or reopen; each refreshes the remark lists it changed.
import type { RemarkCreateInput, RemarkState } from '#shared/utils/remarks'

export function useRemarkActions(slug: string) {
  const refresh = (figure: number) => Promise.all([refreshNuxtData(`remarks-${slug}-${figure}`), refreshNuxtData(`remarks-${slug}`)])
  return {
    async open(input: RemarkCreateInput) {
      const url: string = `/api/companions/${slug}/remarks`
      const { remark } = await $fetch<{ remark: { id: number } }>(url, { method: 'POST', body: input })
      await refresh(input.figureNumber)
      return remark.id
    },
    async reply(id: number, figure: number, body: string) {
      const url: string = `/api/companions/${slug}/remarks/${id}/messages`
      await $fetch(url, { method: 'POST', body: { body } })
      await refresh(figure)
    },
    async setState(id: number, figure: number, state: RemarkState) {
      const url: string = `/api/companions/${slug}/remarks/${id}`
      await $fetch(url, { method: 'PATCH', body: { state } })
      await refresh(figure)
    },
  }
}
