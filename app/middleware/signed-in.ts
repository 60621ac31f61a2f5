// Pages that need an account send visitors to the sign-in page and back afterwards.
export default defineNuxtRouteMiddleware((to) => {
  const { account } = useAccount()
  if (!account.value) return navigateTo({ path: '/sign-in', query: { redirect: to.fullPath } })
})
