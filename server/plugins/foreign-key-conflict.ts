// A write that names a row someone removed at the same moment (a customer removed while an
// enquiry or job was being recorded for them) is refused by the foreign key (23503). Whichever
// route it happens in, that is a 409 with words, never a 500: nothing was saved, reload and retry.
// The removal routes answer their own side of the race themselves (server/api/customers/[id].delete.ts).
export default defineNitroPlugin((nitroApp) => {
  nitroApp.hooks.hook('error', (error) => {
    const e = error as { statusCode?: number, statusMessage?: string, data?: unknown, unhandled?: boolean, fatal?: boolean }
    if ((e.statusCode ?? 500) < 500 || !isForeignKeyViolation(error)) return
    e.statusCode = 409
    e.statusMessage = 'Changed meanwhile'
    e.data = { message: 'Something this refers to was removed while you were saving, so nothing was saved. Reload and try again.' }
    e.unhandled = false
    e.fatal = false
  })
})
