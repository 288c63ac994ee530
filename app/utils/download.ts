/**
 * Hands CSV text made in the browser to the person as a file called `name`. A byte-order mark
 * goes first, so a spreadsheet reads £ and accents as UTF-8.
 */
export function downloadCsv(name: string, csv: string) {
  const url = URL.createObjectURL(new Blob(['\uFEFF', csv], { type: 'text/csv;charset=utf-8' }))
  const a = document.createElement('a')
  a.href = url
  a.download = name
  document.body.appendChild(a)
  a.click()
  a.remove()
  setTimeout(() => URL.revokeObjectURL(url), 60_000)
}
