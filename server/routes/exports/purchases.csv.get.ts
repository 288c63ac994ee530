// The accountant's purchases CSV for a VAT quarter (`quarterOf`) or a date range (`from`, `to`): server/utils/exports.ts.
export default defineEventHandler(event => exportDownload(event, 'purchases'))
