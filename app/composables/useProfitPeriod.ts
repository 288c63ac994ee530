// The profit table's period, kind of customer and whether the totals count the jobs still on
// site, kept in the address so they stay put on a reload and the CSV download asks for the same
// table. Today is worked out once on the server
// and carried to the browser (no mismatch at hydration).
import { londonToday } from '#shared/utils/dates'
import { profitPeriodChoices } from '#shared/utils/period-choices'

export interface ProfitPeriodQuery { from: string, to: string, customerKind?: string, onSite?: 'include' }

export function useProfitPeriod() {
  const route = useRoute()
  const today = useState('profit-today', () => londonToday())
  const choices = computed(() => profitPeriodChoices(today.value))
  const one = (v: unknown) => (typeof v === 'string' ? v : '')
  const query = computed<ProfitPeriodQuery>(() => {
    const kind = one(route.query.customerKind)
    return {
      from: one(route.query.from) || choices.value[0]!.from,
      to: one(route.query.to) || choices.value[0]!.to,
      ...(kind ? { customerKind: kind } : {}),
      ...(one(route.query.onSite) === 'include' ? { onSite: 'include' as const } : {}),
    }
  })
  /** Show another period, kind of customer or count of the jobs on site (the rest stays as it is). */
  function apply(next: Partial<ProfitPeriodQuery>) {
    const q = { ...query.value, ...next }
    return navigateTo({ query: { from: q.from, to: q.to, ...(q.customerKind ? { customerKind: q.customerKind } : {}), ...(q.onSite ? { onSite: q.onSite } : {}) } }, { replace: true })
  }
  const csvHref = computed(() => `/exports/profit.csv?${new URLSearchParams({ ...query.value }).toString()}`)
  return { choices, query, apply, csvHref }
}
