import type { FrameElement, Section } from './types'

/**
 * A member of a frame: its node positions (mm) and the elements between them. Element node
 * indices are global (shifted by `nodeOffset`), so parts are joined by concatenating `nodes`.
 */
export interface MeshPart {
  nodes: Array<{ x: number; y: number }>
  elements: FrameElement[]
  /** Global index of the member's first and last node. */
  first: number
  last: number
}

/** A chain of straight elements through the given points (mm), one element per segment. */
export function meshPolyline(points: Array<{ x: number; y: number }>, section: Section, nodeOffset = 0): MeshPart {
  if (points.length < 2) throw new RangeError('meshPolyline: needs at least two points')
  const elements: FrameElement[] = []
  for (let i = 0; i + 1 < points.length; i++) elements.push({ nodes: [nodeOffset + i, nodeOffset + i + 1], section })
  return { nodes: points.map((p) => ({ x: p.x, y: p.y })), elements, first: nodeOffset, last: nodeOffset + points.length - 1 }
}

/** A straight member from a to b split into `segments` equal elements. */
export function meshStraight(a: { x: number; y: number }, b: { x: number; y: number }, segments: number, section: Section, nodeOffset = 0): MeshPart {
  return meshCurve((s) => ({ x: a.x + (b.x - a.x) * s, y: a.y + (b.y - a.y) * s }), segments, section, nodeOffset)
}

/**
 * A curved member given by a point function of s ∈ [0, 1], split into `segments` straight
 * elements at s = i/segments (or at the given parameter values `stations`, increasing 0..1).
 */
export function meshCurve(
  curve: (s: number) => { x: number; y: number },
  segments: number,
  section: Section,
  nodeOffset = 0,
  stations?: number[],
): MeshPart {
  if (!Number.isInteger(segments) || segments < 1) throw new RangeError('meshCurve: segments must be a whole number of at least 1')
  const s = stations ?? Array.from({ length: segments + 1 }, (_, i) => i / segments)
  if (s.length !== segments + 1) throw new RangeError('meshCurve: stations must have segments + 1 values')
  return meshPolyline(s.map(curve), section, nodeOffset)
}
