import {
  CategoryScale,
  Chart,
  LinearScale,
  LineController,
  LineElement,
  PointElement,
  Tooltip,
} from 'chart.js'

/** Only the parts a small line chart needs, so the bundle stays lean. */
Chart.register(LineController, LineElement, PointElement, LinearScale, CategoryScale, Tooltip)
Chart.defaults.font.family = "'Inter', system-ui, sans-serif"
Chart.defaults.color = '#59626b'

/** The colours of src/assets/base.css, which canvas drawing cannot read from CSS variables. */
export const TREND_COLOURS = {
  accent: '#2c7f78',
  accentFill: 'rgba(44, 127, 120, 0.12)',
  grid: '#eef0f2',
  muted: '#59626b',
  draft: '#ffffff',
} as const
