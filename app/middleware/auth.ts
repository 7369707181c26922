/**
 * Signed-in pages: without a session, go to sign-in and come back afterwards.
 * Loads the user's teams once, so every page knows the current team and role.
 */
export default defineNuxtRouteMiddleware(async (to) => {
  const { loggedIn } = useUserSession()
  if (!loggedIn.value) return navigateTo({ path: '/sign-in', query: { redirect: to.fullPath } })
  const team = useTeamStore()
  try {
    await team.load()
  } catch (err) {
    if (apiStatus(err) === 401) return navigateTo({ path: '/sign-in', query: { redirect: to.fullPath } })
    throw err
  }
  const teamId = to.params.teamId
  if (typeof teamId === 'string') team.selectTeam(teamId)
  // the current team's policy (required margins, thin thresholds): the screens colour by it
  await team.loadPolicy().catch(() => undefined)
})
