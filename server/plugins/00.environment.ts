/**
 * Secrets come only from the environment. In production (BITSLACK_ENV=production, also
 * when BITSLACK_ENV is unset) every required setting must be present,
 * or the server refuses to start with a message that names each missing variable.
 * `npm start` runs the demo (BITSLACK_ENV=demo) with local fakes; `npm test` runs "test".
 */
const PRODUCTION_REQUIRED: { name: string; check?: (v: string) => boolean; hint?: string }[] = [
  { name: 'NUXT_SESSION_PASSWORD', check: (v) => v.length >= 32, hint: 'at least 32 characters' },
  { name: 'DATABASE_URL' },
  { name: 'APP_URL', hint: 'the public URL used in e-mailed links' },
  { name: 'SMTP_HOST' },
  { name: 'SMTP_FROM' },
  { name: 'S3_ENDPOINT' },
  { name: 'S3_BUCKET' },
  { name: 'S3_ACCESS_KEY_ID' },
  { name: 'S3_SECRET_ACCESS_KEY' },
]

export default defineNitroPlugin(() => {
  if (appEnv() !== 'production') return
  const problems = PRODUCTION_REQUIRED.filter(({ name, check }) => {
    const v = process.env[name]
    return !v || (check ? !check(v) : false)
  }).map(({ name, hint }) => (hint ? `${name} (${hint})` : name))
  if (problems.length > 0) {
    console.error(
      `[bitslack] production start refused: set ${problems.join(', ')} in the environment ` +
        '(or BITSLACK_ENV=demo for the local demo with its fakes).',
    )
    process.exit(1)
  }
})
