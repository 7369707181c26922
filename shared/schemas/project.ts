/** Request bodies of the project routes. */
import { z } from 'zod'
import { cleanText } from './text'

export const ProjectName = cleanText(z.string({ error: 'name is required' }).trim().min(1, 'name is required').max(200, 'name is at most 200 characters'), 'name')
export const ProjectDescription = cleanText(z.string().max(4000, 'description is at most 4000 characters'), 'description')

/** Optimistic-locking token: the version the edit was based on. */
export const Version = z.number({ error: 'version is required' }).int('version must be an integer').min(1, 'version must be at least 1')

export const ProjectCreateBody = z.object({ name: ProjectName, description: ProjectDescription.default('') })
export type ProjectCreateBody = z.infer<typeof ProjectCreateBody>

export const ProjectPatchBody = z
  .object({ version: Version, name: ProjectName.optional(), description: ProjectDescription.optional() })
  .refine((b) => b.name !== undefined || b.description !== undefined, { message: 'give name or description', path: ['name'] })
export type ProjectPatchBody = z.infer<typeof ProjectPatchBody>
