/** Response DTOs of projects, links and parts. Dates are ISO 8601 strings. */
import type { Link, Protocol, StageSpec } from '../schemas/link'
import type { PartCategory } from '../schemas/part'
import type { Role } from '../schemas/roles'
import type { Verdict } from './analysis'

/** The analysis of a link condensed at save time (stored on the link row). */
export interface LinkSummaryFields {
  /** the engine's verdict; 'incomplete' while values are still to be entered (not analysed) */
  verdict: Verdict | 'incomplete' | null
  /** values still to be entered (incomplete links) */
  missingValues?: number
  /** worst margin of the frame, unit intervals (UART); null when unbounded or SPI */
  worstMarginUi: number | null
  /** worst slack, seconds: SPI, I2C, CAN, the RS-485 turnaround; null for UART */
  worstSlack: number | null
  /** highest baud meeting the required margin (UART), null when none passes or SPI */
  maxBaud: number | null
  /** highest SCLK meeting every check (SPI), hertz; null when none passes or UART */
  maxSclkHz: number | null
  /** highest SCL meeting every check (I2C), hertz */
  maxSclHz?: number | null
  /** longest bus at the link's bit rate (CAN), metres */
  maxBusLength?: number | null
  /** the check with the least slack (I2C, CAN, RS-485 turnaround) */
  limitingCheck?: string | null
  /** engine version that produced the summary */
  engineVersion: string | null
}

export interface LinkSummaryDto extends LinkSummaryFields {
  id: number
  name: string
  protocol: Protocol
  version: number
  updatedAt: string
  /** the latest signed-off revision, null when none is */
  signedOff?: SignOffRef | null
}

export interface PersonRef {
  id: number
  name: string
}

export interface ProjectDto {
  id: number
  teamId: number
  name: string
  description: string
  version: number
  linkCount: number
  createdAt: string
  updatedAt: string
}

export interface ProjectDetailDto extends ProjectDto {
  /** the caller's role in the project's team */
  role: Role
  links: LinkSummaryDto[]
}

export interface LinkDto {
  id: number
  projectId: number
  /** the project's name (for the page's path), when the route reads it */
  projectName?: string
  teamId: number
  name: string
  version: number
  /** the link, or a draft of it with values still to enter (null), when summary.verdict is 'incomplete' */
  spec: Link
  summary: LinkSummaryFields
  createdAt: string
  updatedAt: string
  updatedBy: PersonRef | null
  /** the caller's role in the link's team */
  role: Role
  /** the latest signed-off revision, null when none is */
  signedOff?: SignOffRef | null
}

export interface PartDto {
  /** stringify it for a stage's `partId` */
  id: number
  teamId: number | null
  name: string
  category: PartCategory
  description: string
  builtIn: boolean
  version: number
  stage: StageSpec
  updatedAt: string
}

/** The link's latest signed-off report revision, and whether the link was saved since (a sign-off never silently outlives its link). */
export interface SignOffRef {
  reportId: number
  /** r1, r2... */
  label: string
  /** the link version the revision froze */
  linkVersion: number
  decidedAt: string | null
  /** the link was saved after that version: the sign-off covers an earlier design */
  changedSince: boolean
}
