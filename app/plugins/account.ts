// Loads the signed-in account during server rendering; the client receives it with the page.
export default defineNuxtPlugin(async () => {
  if (!import.meta.server) return
  const { reload } = useAccount()
  await reload()
})
