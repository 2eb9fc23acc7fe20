import { Chart, LinearScale, LineElement, PointElement, ScatterController, Tooltip } from 'chart.js'

/** Only the parts a scatter plot with straight reference lines needs. */
Chart.register(ScatterController, PointElement, LineElement, LinearScale, Tooltip)

/** The colours of src/assets/base.css, which canvas drawing cannot read from CSS variables. */
export const AGREEMENT_COLOURS = {
  point: 'rgba(44, 127, 120, 0.75)',
  bias: '#2c7f78',
  limits: '#b0563a',
  zero: '#c5cbd1',
  grid: '#eef0f2',
} as const
