// The accountant's payments CSV for a VAT quarter (`quarterOf`) or a date range (`from`, `to`): server/utils/exports.ts.
export default defineEventHandler(event => exportDownload(event, 'payments'))
