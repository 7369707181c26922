import type { CommentTarget } from '#shared/schemas/report'
import type { RecomputeDto, ReportDetailDto, ReviewerOption } from '#shared/types/report'

/**
 * One margin report revision and its review actions. Each action sends the state version
 * the page shows, so a decision made meanwhile by someone else is a 409 (then reloaded).
 */
export function useReport(reportId: () => string) {
  const fetched = useFetch<ReportDetailDto>(() => `/api/reports/${reportId()}`, { key: `report-${reportId()}` })
  const { data: report, error, status, refresh } = fetched
  const busy = ref(false)
  const actionError = ref<string | null>(null)

  async function act(path: string, body: Record<string, unknown>) {
    busy.value = true
    actionError.value = null
    try {
      report.value = await $fetch<ReportDetailDto>(`/api/reports/${reportId()}/${path}`, { method: 'POST', body: { ...body, version: report.value?.version } })
      return true
    } catch (err) {
      actionError.value = apiErrorMessage(err)
      if (apiStatus(err) === 409) await refresh()
      return false
    } finally {
      busy.value = false
    }
  }

  const submit = (reviewerId: number) => act('submit', { reviewerId })
  const signOff = (comment?: string) => act('sign-off', comment ? { comment } : {})
  const sendBack = (comment: string) => act('return', { comment })

  async function comment(body: string, target: CommentTarget) {
    busy.value = true
    actionError.value = null
    try {
      await $fetch(`/api/reports/${reportId()}/comments`, { method: 'POST', body: { body, target } })
      await refresh()
      return true
    } catch (err) {
      actionError.value = apiErrorMessage(err)
      return false
    } finally {
      busy.value = false
    }
  }

  const reviewers = ref<ReviewerOption[]>([])
  async function loadReviewers() {
    reviewers.value = await $fetch<ReviewerOption[]>(`/api/reports/${reportId()}/reviewers`)
  }

  const recomputed = ref<RecomputeDto | null>(null)
  const recomputing = ref(false)
  async function recompute() {
    recomputing.value = true
    actionError.value = null
    try {
      recomputed.value = await $fetch<RecomputeDto>(`/api/reports/${reportId()}/recompute`)
    } catch (err) {
      actionError.value = apiErrorMessage(err)
    } finally {
      recomputing.value = false
    }
  }

  /** await in the page's setup so the server renders the report */
  const ready = Promise.resolve(fetched).then(() => undefined)
  return { ready, report, error, status, refresh, busy, actionError, submit, signOff, sendBack, comment, reviewers, loadReviewers, recomputed, recomputing, recompute }
}
