import type { Permission } from '#shared/utils/roles'

// Convenience only: sends signed-out visitors to the sign-in page. The server protects the data.
const PUBLIC = ['/sign-in', '/sign-up', '/sign-up/', '/invite/', '/enquire/', '/q/', '/i/']

export default defineNuxtRouteMiddleware(async (to) => {
  // an /api path no server route answered reaches the page renderer: it is a 404, not a sign-in page
  // (a catch-all server route would do it too, but it makes Nitro's typed fetch paths too deep to check)
  // likewise a build file that is not there (an old page asking for a script a newer build replaced)
  if (to.path.startsWith('/api/') || to.path.startsWith('/_nuxt/')) return abortNavigation(createError({ statusCode: 404, statusMessage: 'Not found' }))
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
