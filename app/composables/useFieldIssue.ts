import type { ComputedRef, InjectionKey } from 'vue'

/** The editor's context for its fields: the schema's issues by path and whether editing is allowed. */
export interface FieldContext {
  issues: ComputedRef<Record<string, string>>
  readonly: ComputedRef<boolean>
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
  return { issue, readonly }
}
