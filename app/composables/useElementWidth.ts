import type { Ref } from 'vue'

/** The width of an element, kept current with a ResizeObserver (fallback before mount). */
export function useElementWidth(el: Ref<HTMLElement | null>, fallback = 640, min = 320) {
  const width = ref(fallback)
  let ro: ResizeObserver | null = null
  onMounted(() => {
    if (!el.value) return
    width.value = Math.max(min, el.value.clientWidth)
    ro = new ResizeObserver(([e]) => {
      if (e) width.value = Math.max(min, Math.floor(e.contentRect.width))
    })
    ro.observe(el.value)
  })
  onBeforeUnmount(() => ro?.disconnect())
  return width
}
