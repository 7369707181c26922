import type { PartDto } from '#shared/types/workspace'

/** The team's part library (team parts and the built-in generic sets), shared by key. */
export function useParts(teamId: () => string | null | undefined) {
  const { data, status, error, refresh } = useFetch<PartDto[]>(() => `/api/teams/${teamId() ?? '_'}/parts`, {
    key: `parts-${teamId() ?? ''}`,
    immediate: !!teamId(),
    default: () => [],
    transform: (v: unknown) => (Array.isArray(v) ? v : ((v as { parts?: PartDto[] })?.parts ?? [])) as PartDto[],
  })
  return { parts: data, status, error, refresh }
}
