// Switching firm (an accountant serving several, a person in two firms). Nothing of the firm left
// behind may stay on screen under the next firm's name, so the page is taken down before the
// switch and drawn again after it from fresh requests:
//   1. the layout stops drawing the page (`switching`), so no component holds the old answers;
//   2. the server moves the session to the other firm;
//   3. what the phone kept for no signal, the shell's note of it, and every useFetch/useAsyncData
//      answer held by Nuxt are forgotten (clearNuxtData);
//   4. the shell reads who is signed in again (the new firm and role);
//   5. the person stays on the section they were on when it is a list the new role may open
//      (/quarter stays /quarter), otherwise goes to Today (one invoice of the first firm means
//      nothing in the second), and the page is drawn again, fetching everything afresh.

/** A section page the person may open in the firm they are now in: the lists under the bar, Money and Settings. */
function sectionStays(path: string, allows: (p: import('#shared/utils/roles').Permission) => boolean) {
  const item = [...NAV_ITEMS, ...MONEY_ITEMS, ...SETTINGS_ITEMS].find(i => i.to === path)
  return Boolean(item && navAllows(item, allows))
}

export function useFirmSwitch() {
  const shell = useShellStore()
  const offline = useOfflineStore()
  const route = useRoute()
  /** True from the moment the switch starts until the new firm's page can be drawn. */
  const switching = useState('firm-switching', () => false)
  /** Said to screen readers (and shown while switching): where the person now works, or what went wrong. */
  const announcement = ref('')

  async function switchTo(firmId: string) {
    if (!shell.me || firmId === shell.me.firm.id || switching.value) return
    const name = shell.me.firms.find(f => f.id === firmId)?.tradingName ?? 'the other firm'
    const from = route.path
    switching.value = true
    announcement.value = `Opening ${name}…`
    try {
      await nextTick()
      await $fetch('/api/me/firm', { method: 'PUT', body: { firmId } })
      // what was kept for no signal was the other firm's (that code loads with the offline part)
      const { forgetKept } = await import('~/utils/offline-cache')
      await forgetKept()
      offline.forgetFirm()
      clearNuxtData()
      await shell.load()
      const to = sectionStays(from, shell.allows) ? from : '/'
      if (to !== route.path) await navigateTo(to)
      announcement.value = `Now working in ${shell.me?.firm.tradingName ?? name}`
    }
    catch {
      announcement.value = `Could not open ${name}. Check the signal and choose it again.`
      // the firm the server still has this person in
      await shell.load()
    }
    finally {
      switching.value = false
    }
  }

  return { switching, announcement, switchTo }
}
