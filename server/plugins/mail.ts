/**
 * Fail fast on missing mail settings: in production (BITSLACK_ENV unset or production)
 * SMTP_HOST and SMTP_FROM are required; a server that cannot send invitations and reset
 * links must not start as if it could.
 */
export default defineNitroPlugin(() => {
  try {
    smtpSettings()
  } catch (err) {
    console.error('[bitslack]', err instanceof Error ? err.message : err)
    process.exit(1)
  }
})
