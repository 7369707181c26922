// The user stored in the sealed session cookie (nuxt-auth-utils). Roles are NOT kept in
// the session: they are read from the memberships table on every request, so a role
// change or a removal takes effect at once.
declare module '#auth-utils' {
  interface User {
    id: number
    name: string
    email: string
  }
  interface UserSession {
    /** epoch milliseconds of the sign-in */
    loggedInAt?: number
  }
  interface SecureSessionData {
    /** the token of the server-side session row (user_sessions); never sent to the browser */
    sid?: string
  }
}

export {}
