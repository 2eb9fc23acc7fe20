import { describe, expect, it } from 'vitest'
import { viewTransformLinked } from '../../../shared/geometry/linked-view'
import {
  pointStageToImage,
  viewTransformFit,
  viewTransformZoomAroundPoint,
} from '../../../shared/geometry/view-transform'

const film = [3000, 2500] as const
const viewport = [700, 500] as const
const fit = viewTransformFit(film[0], film[1], viewport[0], viewport[1], 16)

describe('viewTransformLinked', () => {
  it('gives the same transform to a film of the same size in an equal viewport', () => {
    const view = viewTransformZoomAroundPoint(fit, 3, [200, 120])
    const linked = viewTransformLinked(
      { view, fit, imageSizePx: film, viewportPx: viewport },
      { fit, imageSizePx: film, viewportPx: viewport },
    )
    expect(linked.scale).toBeCloseTo(view.scale, 12)
    expect(linked.offsetX).toBeCloseTo(view.offsetX, 9)
    expect(linked.offsetY).toBeCloseTo(view.offsetY, 9)
  })

  it('keeps the zoom over fit and the centred point as a fraction of each film', () => {
    const other = [1500, 1400] as const
    const otherViewport = [640, 520] as const
    const otherFit = viewTransformFit(other[0], other[1], otherViewport[0], otherViewport[1], 16)
    const view = viewTransformZoomAroundPoint(fit, 2.5, [500, 300])
    const linked = viewTransformLinked(
      { view, fit, imageSizePx: film, viewportPx: viewport },
      { fit: otherFit, imageSizePx: other, viewportPx: otherViewport },
    )
    expect(linked.scale / otherFit.scale).toBeCloseTo(view.scale / fit.scale, 12)
    const [sx, sy] = pointStageToImage([viewport[0] / 2, viewport[1] / 2], view)
    const [tx, ty] = pointStageToImage([otherViewport[0] / 2, otherViewport[1] / 2], linked)
    expect(tx / other[0]).toBeCloseTo(sx / film[0], 12)
    expect(ty / other[1]).toBeCloseTo(sy / film[1], 12)
    // Linking back returns the first view (the map is its own inverse between the two sides).
    const back = viewTransformLinked(
      { view: linked, fit: otherFit, imageSizePx: other, viewportPx: otherViewport },
      { fit, imageSizePx: film, viewportPx: viewport },
    )
    expect(back.scale).toBeCloseTo(view.scale, 12)
    expect(back.offsetX).toBeCloseTo(view.offsetX, 9)
    expect(back.offsetY).toBeCloseTo(view.offsetY, 9)
  })

  it('maps a fitted view to the fitted view', () => {
    const otherFit = viewTransformFit(800, 600, 400, 400, 16)
    const linked = viewTransformLinked(
      { view: fit, fit, imageSizePx: film, viewportPx: viewport },
      { fit: otherFit, imageSizePx: [800, 600], viewportPx: [400, 400] },
    )
    expect(linked.scale).toBeCloseTo(otherFit.scale, 12)
    expect(linked.offsetX).toBeCloseTo(otherFit.offsetX, 9)
    expect(linked.offsetY).toBeCloseTo(otherFit.offsetY, 9)
  })

  it('leaves the target fitted when the source is degenerate', () => {
    const otherFit = viewTransformFit(800, 600, 400, 400)
    expect(
      viewTransformLinked(
        {
          view: { scale: 0, offsetX: 0, offsetY: 0 },
          fit,
          imageSizePx: film,
          viewportPx: viewport,
        },
        { fit: otherFit, imageSizePx: [800, 600], viewportPx: [400, 400] },
      ),
    ).toEqual(otherFit)
  })
})
