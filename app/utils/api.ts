import type { InternalApi } from 'nitropack/types'

/**
 * The JSON a server route answers, by its path pattern and method, from Nitro's generated types.
 * For `useFetch` calls whose path is built at run time and matches more than one route pattern
 * (`/api/customers/${id}` could be `/api/customers/import`), where the inferred type is lost.
 */
export type ApiResponse<P extends keyof InternalApi, M extends keyof InternalApi[P] = 'get' & keyof InternalApi[P]> = InternalApi[P][M]
