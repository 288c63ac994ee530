/** A site as a choice in a list: its first line and postcode ("14 Quarry Row, BS3 4QT"). */
export function siteOptions(sites: readonly { id: string, line1: string, postcode: string }[]) {
  return sites.map(s => ({ value: s.id as string | null, label: [s.line1, s.postcode].filter(Boolean).join(', ') }))
}
