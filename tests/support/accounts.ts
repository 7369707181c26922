/**
 * Sign-up as a person does it: ask for the account, open the confirmation mail, follow its
 * link (POST the token). Returns the confirming request's answer (201 {user, teams}) with
 * the client now signed in.
 */
import { expect } from 'vitest'
import type { ApiClient } from './api'
import { linkIn, waitForMail } from './mail'

export async function signUpConfirmed(client: ApiClient, body: { name: string; email: string; password: string; teamName: string }) {
  const asked = await client.post('/api/auth/sign-up', body)
  expect(asked.status, JSON.stringify(asked.data)).toBe(202)
  const mail = await waitForMail(body.email.toLowerCase(), { subject: 'Confirm your Bitslack account' })
  const token = linkIn(mail, '/confirm-sign-up').searchParams.get('token')!
  return client.post('/api/auth/sign-up/confirm', { token })
}
