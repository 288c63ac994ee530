import { defineStore } from 'pinia'
import type { Permission, Role } from '#shared/utils/roles'

export interface Me {
  user: { id: string, name: string, email: string }
  firm: { id: string, tradingName: string }
  role: Role
  permissions: Permission[]
  firms: { id: string, tradingName: string, role: Role }[]
}

/** The shell's view of who is signed in, in which firm and role. Loaded from /api/me; the server decides what is allowed. */
export const useShellStore = defineStore('shell', () => {
  const me = ref<Me | null>(null)
  const loaded = ref(false)

  async function load() {
    const fetcher = useRequestFetch()
    try {
      me.value = await fetcher<Me>('/api/me')
    }
    catch {
      me.value = null
    }
    loaded.value = true
    return me.value
  }

  function clear() {
    me.value = null
    loaded.value = false
  }

  const allows = (p: Permission) => Boolean(me.value?.permissions.includes(p))

  return { me, loaded, load, clear, allows }
})
