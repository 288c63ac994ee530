// Every CSV of a VAT quarter (`quarterOf`) or a date range (`from`, `to`) in one ZIP, the quarter-end pack: server/utils/exports.ts.
export default defineEventHandler(event => exportDownload(event, 'pack'))
