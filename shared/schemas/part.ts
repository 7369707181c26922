/** Part library entries: a named, categorised stage parameter set (the link schema's StageSpec). */
import { z } from 'zod'
import { cleanText } from './text'
import { StageSpec } from './link'
import { Version } from './project'

/** Stage classes of the part library. */
export const PART_CATEGORIES = [
  'phototransistor coupler',
  'Darlington coupler',
  'high-speed transistor coupler',
  'logic-output coupler',
  'digital isolator',
  'transceiver',
  'Schmitt buffer',
  'buffer',
  'cable',
  'rc network',
  'other',
] as const
export const PartCategory = z.enum(PART_CATEGORIES, { error: `category must be one of: ${PART_CATEGORIES.join(', ')}` })
export type PartCategory = z.infer<typeof PartCategory>

const PartName = cleanText(z.string({ error: 'name is required' }).trim().min(1, 'name is required').max(120, 'name is at most 120 characters'), 'name')
const PartDescription = cleanText(z.string().max(2000, 'description is at most 2000 characters'), 'description')

export const PartCreateBody = z.object({
  name: PartName,
  category: PartCategory,
  description: PartDescription.default(''),
  stage: StageSpec,
})
export type PartCreateBody = z.infer<typeof PartCreateBody>

export const PartPatchBody = z
  .object({
    version: Version,
    name: PartName.optional(),
    category: PartCategory.optional(),
    description: PartDescription.optional(),
    stage: StageSpec.optional(),
  })
  .refine((b) => b.name !== undefined || b.category !== undefined || b.description !== undefined || b.stage !== undefined, {
    message: 'give at least one of name, category, description, stage',
    path: ['name'],
  })
export type PartPatchBody = z.infer<typeof PartPatchBody>
