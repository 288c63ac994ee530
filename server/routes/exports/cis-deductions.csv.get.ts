// The accountant's cis-deductions CSV for a VAT quarter (`quarterOf`) or a date range (`from`, `to`): server/utils/exports.ts.
export default defineEventHandler(event => exportDownload(event, 'cis-deductions'))
