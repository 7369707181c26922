/** The mail module's data: what a template produces and what waits in the job queue. */

/** One message before rendering: who, the subject, the words and the one action it asks for. */
export interface MailContent {
  to: string
  subject: string
  /** greeting line, e.g. "Hello," */
  greeting: string
  /** paragraphs of plain text */
  paragraphs: string[]
  /** the one action the mail asks for */
  action: { label: string; url: string }
  /** closing note under the action (e.g. expiry) */
  footnote?: string
}

/** A rendered mail as it waits in the job queue. */
export interface QueuedMail {
  to: string
  subject: string
  text: string
  html: string
}
