// Names shared by the service worker (app/service-worker/sw.ts) and the app.

/** The app shell: the same app rendered with no server-side data (routeRules ssr: false), served for any page opened with no signal. */
export const APP_SHELL_URL = '/app-shell'
/** Where the shell is kept (replaced at each install of a new build). */
export const SHELL_CACHE = 'setwell-shell'
/** Where good GET /api answers are kept, for use with no signal. Emptied on sign-out and on any 401. */
export const DATA_CACHE = 'setwell-data'
/** Set on every kept answer: when it was kept (ISO time). An answer that carries it came from the phone, not the server. */
export const SAVED_AT_HEADER = 'x-setwell-saved-at'
/** How long to wait for the network before using what was kept (a phone with one bar can hang for a minute). */
export const NETWORK_WAIT_SECONDS = 10
/** Pages as the server drew them, kept for use with no signal. Emptied on sign-out, on being sent to sign in, and by a new build. */
export const PAGES_CACHE = 'setwell-pages'
/** Put in a kept page's head: when it was kept (ISO time). */
export const SAVED_AT_META = 'setwell-saved-at'
/** Pages never kept (nothing of the firm's on them, or a customer's). */
export const PUBLIC_PAGES = ['/sign-in', '/sign-up', '/invite/', '/enquire/', '/q/', '/i/', '/app-shell']
