import type { ConfigDto } from '../../shared/types/account'

/** Public client configuration: the local mail fake's inbox in demo and development, null in production. */
export default defineApiHandler((): ConfigDto => ({ mailInboxUrl: mailInboxUrl() }))
