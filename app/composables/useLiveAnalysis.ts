import type { LinkAnalysis } from '#shared/types/analysis'

/**
 * Live analysis of the draft link: every complete, valid edit is sent to POST /api/analyze
 * after a short pause; the previous result stays on screen (dimmed) until the new one
 * arrives, and only the answer to the latest request is kept. A draft with values missing or
 * fields to fix is not analysed, and its old result is dropped (never a stale verdict).
 */
export function useLiveAnalysis(delayMs = 350) {
  const store = useDraftLinkStore()
  let timer: ReturnType<typeof setTimeout> | null = null
  let seq = 0

  async function run() {
    const link = store.check?.link
    if (!store.valid || !link) return
    const mine = ++seq
    store.beginAnalysis()
    try {
      const result = await $fetch<LinkAnalysis>('/api/analyze', { method: 'POST', body: link })
      if (mine === seq) store.applyAnalysis(result)
    } catch (err) {
      if (mine === seq) store.failAnalysis(apiErrorMessage(err, 'The analysis failed.'), apiIssues(err))
    }
  }

  function schedule(immediate = false) {
    if (timer) clearTimeout(timer)
    if (!store.valid) {
      seq++ // an answer still in flight belongs to an older draft
      store.clearAnalysis()
      return
    }
    store.beginAnalysis()
    timer = setTimeout(run, immediate ? 0 : delayMs)
  }

  if (import.meta.client) {
    watch(() => [JSON.stringify(store.draft), store.valid], () => schedule(), { flush: 'post' })
    onBeforeUnmount(() => {
      if (timer) clearTimeout(timer)
      seq++
    })
  }

  return { schedule, run }
}
