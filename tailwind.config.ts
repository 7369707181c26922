import type { Config } from 'tailwindcss'
import defaultTheme from 'tailwindcss/defaultTheme'

// Bitslack's own look: calm slate surfaces; margin colours teal (healthy),
// amber (thin), rose (broken), always paired with a text label.
export default <Partial<Config>>{
  content: ['./app/**/*.{vue,ts}', './shared/**/*.ts'],
  theme: {
    extend: {
      fontFamily: {
        sans: ['Inter', ...defaultTheme.fontFamily.sans],
        mono: ['"JetBrains Mono"', ...defaultTheme.fontFamily.mono],
      },
      colors: {
        healthy: { DEFAULT: '#0d6b63', soft: '#ccfbf1' },
        thin: { DEFAULT: '#a04a07', soft: '#fef3c7' },
        broken: { DEFAULT: '#be123c', soft: '#ffe4e6' },
        ink: { DEFAULT: '#1e293b', muted: '#56657a' },
      },
    },
  },
}
