import type { Permission } from '#shared/utils/roles'

// Convenience only: sends signed-out visitors to the sign-in page. The server protects the data.
const PUBLIC = ['/sign-in', '/sign-up', '/invite/']

export default defineNuxtRouteMiddleware(async (to) => {
  const isPublic = PUBLIC.some(p => to.path === p || (p.endsWith('/') && to.path.startsWith(p)))
  const shell = useShellStore()
  if (!shell.loaded) await shell.load()
  if (isPublic) {
    if (shell.me && (to.path === '/sign-in' || to.path === '/sign-up')) return navigateTo('/')
    return
  }
  if (!shell.me) return navigateTo({ path: '/sign-in', query: to.fullPath !== '/' ? { next: to.fullPath } : undefined })
  const need = to.meta.permission as Permission | undefined
  if (need && !shell.allows(need)) return navigateTo('/')
})
