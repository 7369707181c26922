import { defineStore } from 'pinia'
import type { Role } from '#shared/schemas/roles'
import { DEFAULT_TEAM_POLICY, type TeamPolicy } from '#shared/schemas/team'

import type { AuthDto } from '#shared/types/account'

type MeView = AuthDto

/** Where the user is, for the navigation: filled in by the page that knows it. */
export interface NavPlace {
  projectId?: string
  projectName?: string
  linkId?: string
  linkName?: string
  section?: 'projects' | 'parts' | 'members' | 'settings' | 'audit' | 'project' | 'link'
}

const ROLE_RANK: Record<Role, number> = { admin: 3, engineer: 2, reviewer: 1, viewer: 0 }

/**
 * Cross-page state of the signed-in user: who they are, their teams, the team they
 * work in now and where they are in it. Setup store, SSR-safe (state lives per request).
 */
export const useTeamStore = defineStore('team', () => {
  const me = ref<MeView | null>(null)
  const currentTeamId = ref<string | null>(null)
  const currentTeamKey = computed(() => currentTeamId.value)
  const place = ref<NavPlace>({})
  /** the current team's engineering policy (required margins, thin thresholds), loaded per team */
  const policies = ref<Record<string, { version: number; policy: TeamPolicy }>>({})
  const policy = computed<TeamPolicy>(() => (currentTeamKey.value ? policies.value[currentTeamKey.value]?.policy : null) ?? DEFAULT_TEAM_POLICY)

  const teams = computed(() => me.value?.teams ?? [])
  const currentTeam = computed(() => teams.value.find((t) => String(t.id) === currentTeamKey.value) ?? teams.value[0] ?? null)
  const role = computed<Role | null>(() => currentTeam.value?.role ?? null)

  /** the current role is at least `min` */
  function roleAtLeast(min: Role, r: Role | null = role.value) {
    return r !== null && ROLE_RANK[r] >= ROLE_RANK[min]
  }
  /** engineers and admins edit links, projects and parts */
  const canEdit = computed(() => roleAtLeast('engineer'))
  const isAdmin = computed(() => role.value === 'admin')

  async function load(force = false) {
    if (me.value && !force) return me.value
    // forwards the session cookie during SSR; plain $fetch in the browser
    const fetcher = useRequestFetch() as unknown as (url: string) => Promise<unknown>
    me.value = (await fetcher('/api/auth/me')) as MeView
    if (!currentTeamId.value && me.value.teams[0]) currentTeamId.value = String(me.value.teams[0].id)
    return me.value
  }

  /** Load (or reload) a team's policy; the current team's by default. */
  async function loadPolicy(teamId = currentTeamKey.value, force = false) {
    if (!teamId || (policies.value[teamId] && !force)) return
    const fetcher = useRequestFetch() as unknown as (url: string) => Promise<{ version: number; policy: TeamPolicy }>
    const p = await fetcher(`/api/teams/${teamId}/policy`)
    policies.value = { ...policies.value, [teamId]: { version: p.version, policy: p.policy } }
  }

  function selectTeam(teamId: string | null | undefined) {
    if (teamId) currentTeamId.value = teamId
  }

  function setPlace(p: NavPlace) {
    place.value = p
  }

  function reset() {
    me.value = null
    currentTeamId.value = null
    place.value = {}
    policies.value = {}
  }

  return { me, teams, currentTeamId, currentTeam, role, canEdit, isAdmin, place, policies, policy, roleAtLeast, load, loadPolicy, selectTeam, setPlace, reset }
})
