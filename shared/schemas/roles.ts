import { z } from 'zod'

/** Team roles, from most to least privileged. */
export const ROLES = ['admin', 'engineer', 'reviewer', 'viewer'] as const
export const Role = z.enum(ROLES)
export type Role = z.infer<typeof Role>
