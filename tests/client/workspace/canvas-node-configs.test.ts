import { describe, expect, it } from 'vitest'
import {
  calibrationLineConfigs,
  landmarkNodeConfigs,
  selectedLabelConfigs,
  suggestionNodeConfigs,
} from '@/components/workspace/canvas-node-configs'

// At a zoom of 25 % one screen px covers four image px (the view transform's own arithmetic).
const quarterZoom = (css: number) => css * 4

describe('canvas node settings', () => {
  it('keeps landmark dots the same size on screen whatever the zoom, the selected one larger', () => {
    const nodes = landmarkNodeConfigs(
      { 'L5.as': [100, 200], 'L5.ps': [160, 205] },
      { selectedName: 'L5.ps', draggable: true, px: quarterZoom },
    )
    expect(nodes.map((node) => [node.name, node.selected, node.config.radius])).toEqual([
      ['L5.as', false, 18],
      ['L5.ps', true, 24],
    ])
    expect(nodes[0]!.config).toMatchObject({
      name: 'landmark:L5.as',
      x: 100,
      y: 200,
      draggable: true,
    })
  })

  it('makes landmarks fixed when the reading cannot be edited', () => {
    const [node] = landmarkNodeConfigs(
      { 'S1.as': [10, 20] },
      { selectedName: null, draggable: false, px: quarterZoom },
    )
    expect(node!.config.draggable).toBe(false)
  })

  it('draws a calibration line only while one is drawn', () => {
    expect(calibrationLineConfigs(null, quarterZoom)).toEqual([])
    const [halo, line] = calibrationLineConfigs({ from: [0, 0], to: [30, 40] }, quarterZoom)
    expect(halo!.points).toEqual([0, 0, 30, 40])
    expect(line).toMatchObject({ id: 'cal', dash: [32, 16] })
  })

  it('joins a corner suggestion to the rater’s point and names the two keys', () => {
    expect(suggestionNodeConfigs(null, quarterZoom)).toBeNull()
    const nodes = suggestionNodeConfigs(
      { name: 'L5.as', side: 'primary', from: [100, 100], at: [104, 97] },
      quarterZoom,
    )!
    expect(nodes.line.points).toEqual([100, 100, 104, 97])
    expect(nodes.mark).toMatchObject({ name: 'corner-suggestion', x: 104, y: 97 })
    expect(nodes.text.text).toContain('Enter accepts')
  })

  it('labels the selected landmark with its name beside it', () => {
    expect(selectedLabelConfigs(null, quarterZoom)).toBeNull()
    const label = selectedLabelConfigs({ name: 'L4.pi', point: [50, 60] }, quarterZoom)!
    expect(label.text.text).toBe('L4.pi')
    expect(label.label).toMatchObject({ x: 50 + 56, y: 60 - 40 })
  })
})
