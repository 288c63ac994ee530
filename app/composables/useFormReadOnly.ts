// A part of a screen whose values the person may read but not change (the accountant on the
// firm's rates, a sent quote): provideFormReadOnly(() => true) at its top, and FormField,
// FormSelect and PriceBookCheck below it show their value as text under the label instead of a
// field. Greyed-out fields look live to many people; text does not.
import type { ComputedRef, InjectionKey, MaybeRefOrGetter } from 'vue'

const READ_ONLY: InjectionKey<ComputedRef<boolean>> = Symbol('form-read-only')

export function provideFormReadOnly(readOnly: MaybeRefOrGetter<boolean>) {
  provide(READ_ONLY, computed(() => toValue(readOnly)))
}

/** True inside a part provided as read only. */
export function useFormReadOnly(): ComputedRef<boolean> {
  return inject(READ_ONLY, computed(() => false))
}
