/** Any /api path without a handler is a JSON 404 (not the app's sign-in page). */
export default defineEventHandler(() => notFound())
