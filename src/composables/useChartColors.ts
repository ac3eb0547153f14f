import { computed } from 'vue'
import { useTheme } from 'vuetify'
import type { ChartColors } from '@/components/charts/options'

/** ECharts needs real colour values, not CSS variables; these follow the light or dark theme. */
export function useChartColors() {
  const theme = useTheme()
  return computed<ChartColors>(() => {
    const colors = theme.current.value.colors as Record<string, unknown>
    const pick = (name: string, fallback: string) => (typeof colors[name] === 'string' ? (colors[name] as string) : fallback)
    return {
      line: pick('primary', '#11606B'),
      envelope: pick('primary', '#11606B'),
      band: pick('steady', '#2F7D5B'),
      kit: pick('secondary', '#3E4A61'),
      text: pick('on-surface', '#1D2B2E'),
    }
  })
}
