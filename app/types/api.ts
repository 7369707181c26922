/**
 * The response shapes the UI reads: the API's DTOs from shared/types, under the names the
 * components use. Analysis results are the engine's own exported types (type-only).
 */
export type { Verdict, LinkSummaryDto as LinkSummary, ProjectDto as ProjectSummary, ProjectDetailDto as ProjectView, LinkDto as LinkView, PartDto as PartView } from '#shared/types/workspace'
export type { MemberDto as MemberView, InvitationDto as InvitationListItem, InvitationPreviewDto, AuthDto, ConfigDto } from '#shared/types/account'
