// The signed-in account (null when nobody is), loaded once per visit by the account plugin
// and reloaded after sign-in, sign-out and profile changes.
interface AccountState {
  id: string
  email: string
  displayName: string
  affiliation: string
  orcid: string | null
  siteRole: 'admin' | 'member'
}

export function useAccount() {
  const account = useState<AccountState | null>('account', () => null)
  const requestFetch = useRequestFetch()

  async function reload() {
    const { account: current } = await requestFetch('/api/auth/session')
    account.value = current
  }

  return { account, reload }
}
