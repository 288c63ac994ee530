// The quarter screen's period: a VAT quarter on the firm's stagger (this one and the seven before)
// or dates of the person's choosing. The address says which period is shown, so a reload or a
// shared link shows the same.
import { londonToday, longIsoDate } from '#shared/utils/dates'
import { recentVatQuarters } from '#shared/utils/period-choices'

export type QuarterMode = 'quarter' | 'range'

export function useQuarterPeriod(stagger: Ref<1 | 2 | 3>) {
  const route = useRoute()
  const router = useRouter()
  const todayIso = londonToday()
  const quarters = computed(() => recentVatQuarters(todayIso, stagger.value, 8).map((q, i) => ({
    ...q,
    label: `${longIsoDate(q.start)} to ${longIsoDate(q.end)}${i === 0 ? ' (this quarter)' : i === 1 ? ' (last quarter)' : ''}`,
  })))
  const asked = (key: string) => (typeof route.query[key] === 'string' ? route.query[key] : '')
  const last = quarters.value[1]
  const mode = ref<QuarterMode>(route.query.from ? 'range' : 'quarter')
  const quarterOf = ref(asked('quarterOf') || (last?.start ?? todayIso))
  const from = ref(asked('from') || (last?.start ?? todayIso))
  const to = ref(asked('to') || (last?.end ?? todayIso))
  const query = computed((): Record<string, string> => (mode.value === 'quarter' ? { quarterOf: quarterOf.value } : { from: from.value, to: to.value }))
  watch(query, q => router.replace({ query: q }))
  onMounted(() => router.replace({ query: query.value }))
  return { quarters, mode, quarterOf, from, to, query }
}
