import type { CaptureDto } from '#shared/types/capture'

/** captures per page (the server's default page) */
const PAGE = 20

/**
 * A link's captures, a page at a time (newest first; the list carries summaries only), the
 * first page refreshed every second while any extraction is queued or running (the progress
 * the job writes), older pages on demand, and the upload action with its own upload progress.
 * The list is fetched in the browser: the server's render of the link page stays as light as the
 * page without captures.
 */
export function useCaptures(linkId: () => string) {
  const total = useState<number>(`captures-total-${linkId()}`, () => 0)
  const readTotal = (headers: Headers) => {
    const n = Number(headers.get('x-total-count'))
    if (Number.isInteger(n)) total.value = n
  }
  const { data: first, refresh, error, status } = useFetch<CaptureDto[]>(() => `/api/links/${linkId()}/captures`, {
    key: `captures-${linkId()}`,
    query: { limit: PAGE },
    server: false,
    default: () => [],
    onResponse: ({ response }) => readTotal(response.headers),
  })
  const older = ref<CaptureDto[]>([])
  /** the first page, then the older pages loaded so far (an id appears once) */
  const data = computed(() => {
    const seen = new Set(first.value.map((c) => c.id))
    return [...first.value, ...older.value.filter((c) => !seen.has(c.id))]
  })
  const loadingMore = ref(false)
  /** The next page of older captures. */
  async function showMore() {
    loadingMore.value = true
    try {
      const res = await $fetch.raw<CaptureDto[]>(`/api/links/${linkId()}/captures`, { query: { limit: PAGE, offset: data.value.length } })
      readTotal(res.headers)
      older.value.push(...(res._data ?? []))
    } finally {
      loadingMore.value = false
    }
  }
  /** the first page is still on its way */
  const loading = computed(() => (status.value === 'idle' || status.value === 'pending') && !first.value.length)
  const working = computed(() => first.value.some((c) => c.status === 'queued' || c.status === 'running'))
  let timer: ReturnType<typeof setInterval> | undefined
  watch(
    working,
    (w) => {
      if (import.meta.server) return
      if (w && !timer) timer = setInterval(() => refresh(), 1000)
      if (!w && timer) {
        clearInterval(timer)
        timer = undefined
      }
    },
    { immediate: true },
  )
  onBeforeUnmount(() => timer && clearInterval(timer))

  const uploading = ref(false)
  /** 0..1 while the bytes go up */
  const uploadProgress = ref(0)
  const uploadError = ref<string | null>(null)

  /** Upload with progress (app/utils/upload.ts); refreshes the list when stored. */
  async function upload(file: File, fields: Record<string, string>): Promise<CaptureDto | null> {
    uploading.value = true
    uploadProgress.value = 0
    uploadError.value = null
    const form = new FormData()
    for (const [k, v] of Object.entries(fields)) if (v !== '') form.set(k, v)
    form.set('file', file, file.name)
    const answer = await uploadWithProgress<CaptureDto>(`/api/links/${linkId()}/captures`, form, (f) => (uploadProgress.value = f))
    uploading.value = false
    if (!answer.ok) {
      uploadError.value = answer.message
      return null
    }
    await refresh()
    return answer.body
  }

  async function remove(id: number) {
    await $fetch(`/api/captures/${id}`, { method: 'DELETE' })
    older.value = older.value.filter((c) => c.id !== id)
    await refresh()
  }

  return { captures: data, total, loading, showMore, loadingMore, refresh, error, status, upload, uploading, uploadProgress, uploadError, remove }
}
