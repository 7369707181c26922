/**
 * After a successful sign-in, sign-up or invitation: refresh the session, load the
 * teams and go where the user was heading (or to their first team).
 */
export function useSignedIn() {
  const { fetch: refreshSession } = useUserSession()
  const team = useTeamStore()
  const route = useRoute()
  return async function goIn(teamId?: string) {
    await refreshSession()
    await team.load(true)
    if (teamId) team.selectTeam(teamId)
    const redirect = typeof route.query.redirect === 'string' && route.query.redirect.startsWith('/') ? route.query.redirect : null
    const t = team.currentTeam
    await navigateTo(redirect ?? (t ? `/teams/${t.id}` : '/'))
  }
}
