// Whether this server has a development inbox (an SMTP fake outside production), for the footer link.
export default defineNuxtPlugin(() => {
  const config = useRuntimeConfig()
  useState('dev-inbox', () => config.deployment !== 'production' && Boolean(config.mailInboxUrl))
})
