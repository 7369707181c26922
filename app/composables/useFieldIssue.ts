import type { ComputedRef, InjectionKey, Ref } from 'vue'

/** The editor's context for its fields: the schema's issues by path and whether editing is allowed. */
export interface FieldContext {
  issues: ComputedRef<Record<string, string>>
  readonly: ComputedRef<boolean>
  /**
   * Text the fields could not read yet ("banana" in a baud field), by path: the model keeps
   * its last good value, so the page must know the field is not what the analysis used.
   */
  typing?: Ref<Record<string, string>>
}

export const FIELD_CONTEXT: InjectionKey<FieldContext> = Symbol('field-context')

/** The schema issue of one field path, and whether the field is read-only. */
export function useFieldIssue(path: () => string | undefined) {
  const ctx = inject(FIELD_CONTEXT, null)
  const issue = computed(() => {
    const p = path()
    return p && ctx ? (ctx.issues.value[p] ?? null) : null
  })
  const readonly = computed(() => ctx?.readonly.value ?? false)
  /** report (or clear, with null) a text the field could not read */
  function reportTyping(message: string | null) {
    const p = path()
    if (!p || !ctx?.typing) return
    const next = { ...ctx.typing.value }
    if (message) next[p] = message
    else delete next[p]
    ctx.typing.value = next
  }
  return { issue, readonly, reportTyping }
}
