/**
 * Which environment the server runs in: BITSLACK_ENV when set, else production for a
 * built server (NODE_ENV=production) and development otherwise. Demo and test use local
 * fakes for mail and storage; production takes every setting from the environment.
 */
export function bitslackEnvironment(): 'production' | 'demo' | 'development' | 'test' {
  const env = process.env.BITSLACK_ENV
  if (env === 'demo' || env === 'development' || env === 'test' || env === 'production') return env
  return process.env.NODE_ENV === 'production' ? 'production' : 'development'
}
