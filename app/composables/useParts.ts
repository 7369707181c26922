import type { PartView } from '~/types/api'

/** The team's part library (team parts and the built-in generic sets), shared by key. */
export function useParts(teamId: () => string | null | undefined) {
  const { data, status, error, refresh } = useFetch<PartView[]>(() => `/api/teams/${teamId() ?? '_'}/parts`, {
    key: `parts-${teamId() ?? ''}`,
    immediate: !!teamId(),
    default: () => [],
    transform: (v: unknown) => (Array.isArray(v) ? v : ((v as { parts?: PartView[] })?.parts ?? [])) as PartView[],
  })
  return { parts: data, status, error, refresh }
}
