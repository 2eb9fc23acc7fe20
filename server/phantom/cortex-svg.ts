/**
 * A bone drawn with its cortex inside its outline: the trabecular fill, the marrow shading and
 * a bright rim clipped to the outline, so the outer edge of the bright bone runs exactly
 * through the path's vertices. The landmark corners are those vertices, as the corners of a
 * real body are the outer corners of its cortical rim.
 */
export function boneWithCortex(options: {
  id: string
  d: string
  /** Visible rim width in pixels. */
  cortexPx: number
  fillOpacity?: number
  rimColour?: string
  marrow?: boolean
}): string {
  const { id, d, cortexPx } = options
  const opacity = options.fillOpacity === undefined ? '' : ` fill-opacity="${options.fillOpacity}"`
  return [
    `<clipPath id="${id}"><path d="${d}"/></clipPath>`,
    `<path d="${d}" fill="url(#trabecular)"${opacity}/>`,
    options.marrow === false ? '' : `<path d="${d}" fill="url(#marrow)"/>`,
    // Twice the rim width, centred on the outline: the clip keeps the inner half.
    `<path d="${d}" fill="none" stroke="${options.rimColour ?? '#e0e0e0'}" stroke-width="${(2 * cortexPx).toFixed(2)}" clip-path="url(#${id})"/>`,
  ].join('')
}
