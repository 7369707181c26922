import { defineStore } from 'pinia'
import { computed, ref } from 'vue'
import { apiErrorMessage, apiIssues, apiStatus } from '../utils/apiError'
import { memoOnServer } from '../utils/memoOnServer'
import type { LinkInput } from '#shared/schemas/link'
import { checkLinkDraft } from '#shared/schemas/linkDraft'
import type { LinkAnalysis, PullupSweepRow } from '#shared/types/analysis'
import type { LinkDto } from '#shared/types/workspace'

/** The server's answer to a stale save (409): the version now stored and the link as stored. */
export interface SaveConflict {
  currentVersion: number
  link: LinkDto | null
}

function clone<T>(v: T): T {
  return JSON.parse(JSON.stringify(v)) as T
}

/**
 * JSON with object keys sorted: the stored spec comes back from PostgreSQL's jsonb with its
 * keys reordered, so equality of specs must not depend on key order.
 */
function canonical(v: unknown): string {
  return JSON.stringify(v, (_k, x) =>
    x && typeof x === 'object' && !Array.isArray(x) ? Object.fromEntries(Object.keys(x).sort().map((k) => [k, (x as Record<string, unknown>)[k]])) : x,
  )
}

/**
 * The link being edited: the saved version from the server, the draft with unsaved
 * edits, the schema's issues as the user types, the latest analysis of the draft and
 * the state of an explicit save (with the 409 of a concurrent edit).
 */
export const useDraftLinkStore = defineStore('draftLink', () => {
  const linkId = ref<string | null>(null)
  const saved = ref<LinkDto | null>(null)
  const draft = ref<LinkInput | null>(null)

  const analysis = ref<LinkAnalysis | null>(null)
  /** the draft the analysis belongs to has been superseded by edits not yet analysed */
  const analysing = ref(false)
  const analysisError = ref<string | null>(null)
  /** issues the server's analysis returned (400 with issues), keyed by dotted path */
  const serverIssues = ref<Record<string, string>>({})

  const saving = ref(false)
  const saveError = ref<string | null>(null)
  const conflict = ref<SaveConflict | null>(null)
  const savedAt = ref<string | null>(null)

  /** the draft against the shared schema: complete, or values still missing, or real problems */
  const checkDraft = memoOnServer(checkLinkDraft)
  const check = computed(() => (draft.value ? checkDraft(draft.value) : null))
  /** text typed into fields that could not be read yet, by dotted path (the fields report it) */
  const typing = ref<Record<string, string>>({})
  /** schema issues of the draft and fields not read yet, keyed by dotted path (first message per path) */
  const issuesOf = memoOnServer((typed: Record<string, string>, c: ReturnType<typeof checkLinkDraft> | null, fromServer: Record<string, string>) => {
    const out: Record<string, string> = { ...typed }
    if (c) {
      for (const i of c.issues) out[i.path.map(String).join('.')] ??= i.message
      for (const m of c.missing) out[m.map(String).join('.')] ??= 'enter a value'
    }
    for (const [k, m] of Object.entries(fromServer)) out[k] ??= m
    return out
  })
  const issues = computed<Record<string, string>>(() => issuesOf(typing.value, check.value, serverIssues.value))
  /** values still to enter (a new link's blank stages) */
  const missingCount = computed(() => check.value?.missing.length ?? 0)
  /** fields to fix: real schema problems and text not read, by distinct field */
  const fixCount = computed(() => {
    const c = check.value
    const paths = new Set(Object.keys(typing.value))
    for (const i of c?.issues ?? []) paths.add(i.path.map(String).join('.'))
    return paths.size
  })
  /** complete and without problems: the engine can analyse it */
  const valid = computed(() => !!check.value?.link && Object.keys(typing.value).length === 0)
  /** may be saved: no real problem (values may still be missing) */
  const savable = computed(() => !!check.value && fixCount.value === 0)
  const differs = memoOnServer((d: LinkInput, s: LinkDto) => canonical(d) !== canonical(s.spec))
  const dirty = computed(() => !!draft.value && !!saved.value && differs(draft.value, saved.value))

  function load(link: LinkDto) {
    linkId.value = String(link.id)
    saved.value = clone(link)
    draft.value = clone(link.spec)
    conflict.value = null
    saveError.value = null
    serverIssues.value = {}
    typing.value = {}
  }

  /** Drop unsaved edits. */
  function revert() {
    if (saved.value) draft.value = clone(saved.value.spec)
  }

  async function save(): Promise<boolean> {
    if (!draft.value || !saved.value || !linkId.value) return false
    saving.value = true
    saveError.value = null
    try {
      const sent = canonical(draft.value)
      const res = await $fetch<LinkDto>(`/api/links/${linkId.value}`, {
        method: 'PATCH',
        body: { version: saved.value.version, spec: draft.value },
      })
      saved.value = clone(res)
      // the server stores the link as the schema reads it (defaults filled in): take that form,
      // unless the draft was edited while the request was in flight (those edits stay unsaved)
      if (canonical(draft.value) === sent) draft.value = clone(res.spec)
      conflict.value = null
      savedAt.value = new Date().toISOString()
      return true
    } catch (err) {
      const status = apiStatus(err)
      if (status === 409) {
        const data = (err as { data?: { data?: { currentVersion?: number; link?: LinkDto } } }).data?.data
        conflict.value = { currentVersion: data?.currentVersion ?? saved.value.version + 1, link: data?.link ?? null }
      } else {
        saveError.value = apiErrorMessage(err, 'The link could not be saved.')
        if (status === 400) serverIssues.value = apiIssues(err)
      }
      return false
    } finally {
      saving.value = false
    }
  }

  /** Conflict: take the version another person saved, discarding mine. */
  function takeTheirs() {
    if (conflict.value?.link) load(conflict.value.link)
  }

  /** Conflict: keep my draft and save it over the newer version. */
  async function keepMine() {
    const c = conflict.value
    if (!c || !saved.value) return false
    saved.value = c.link ? { ...clone(c.link) } : { ...saved.value, version: c.currentVersion }
    conflict.value = null
    return save()
  }

  /** An analysis of the current draft is on its way (the shown result dims). */
  function beginAnalysis() {
    analysing.value = true
  }
  /** The server's analysis of the current draft: shown, with any earlier error cleared. */
  function applyAnalysis(a: LinkAnalysis) {
    analysis.value = a
    analysisError.value = null
    serverIssues.value = {}
    analysing.value = false
  }
  /** The analysis failed: its message, and the fields the server named. */
  function failAnalysis(message: string, issues: Record<string, string>) {
    analysisError.value = message
    serverIssues.value = issues
    analysing.value = false
  }
  /** The draft cannot be analysed (values missing or fields to fix): no result is shown, never a stale one. */
  function clearAnalysis() {
    analysis.value = null
    analysing.value = false
  }
  /**
   * Apply a pull-up sweep row to a phototransistor stage: its pull-up, its LED resistor (in
   * place of an LED current) and its base-emitter resistor (the open-base row of an RBE sweep
   * removes one).
   */
  function applySweepRow(channelIndex: number, stageIndex: number, row: PullupSweepRow) {
    const st = draft.value?.channels[channelIndex]?.stages[stageIndex]
    if (!st || st.kind !== 'phototransistor') return
    st.rl = row.rl
    if (row.rLed !== null) {
      st.rLed = row.rLed
      delete st.ledCurrent
    }
    if (row.rbe !== null) st.rbe = row.rbe
    else delete st.rbe
  }
  /** Replace the draft with a changed spec (a capture applied to a stage, an import). */
  function replaceDraft(spec: LinkInput) {
    draft.value = clone(spec)
  }

  function reset() {
    linkId.value = null
    saved.value = null
    draft.value = null
    analysis.value = null
    analysisError.value = null
    conflict.value = null
    saveError.value = null
    serverIssues.value = {}
    typing.value = {}
  }

  return {
    linkId, saved, draft, analysis, analysing, analysisError, serverIssues, saving, saveError, conflict, savedAt,
    check, typing, issues, missingCount, fixCount, valid, savable, dirty, load, revert, save, takeTheirs, keepMine,
    beginAnalysis, applyAnalysis, failAnalysis, clearAnalysis, applySweepRow, replaceDraft, reset,
  }
})
