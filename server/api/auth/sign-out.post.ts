/** Sign out: clears the session cookie. 204, also when already signed out. */
export default defineApiHandler(async (event) => {
  await clearUserSession(event)
  return sendNoContent(event, 204)
})
