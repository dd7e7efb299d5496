import { describe, expect, it } from 'vitest'
import { boundingBox, fitCamera, polygonsToPositions } from '../previewGeometry'

describe('JSCAD polygons to triangles', () => {
  it('fans a convex polygon of n vertices into n − 2 triangles', () => {
    const square = { vertices: [[0, 0, 0], [2, 0, 0], [2, 1, 0], [0, 1, 0]] }
    const pentagon = { vertices: [[0, 0, 1], [1, 0, 1], [1.5, 1, 1], [0.5, 2, 1], [-0.5, 1, 1]] }
    const observed = polygonsToPositions([square, pentagon])
    expect(observed.length).toBe((2 + 3) * 9)
    // first triangle of the square: v0, v1, v2
    expect(Array.from(observed.slice(0, 9))).toEqual([0, 0, 0, 2, 0, 0, 2, 1, 0])
  })

  it('finds the bounding box of the positions', () => {
    expect(boundingBox(new Float32Array([0, -1, 2, 4, 3, -2, 1, 1, 1]))).toEqual({ min: [0, -1, -2], max: [4, 3, 2] })
    expect(boundingBox(new Float32Array(0))).toBeNull()
  })
})

describe('camera fit', () => {
  // a 60 × 20 × 6 mm part: bounding sphere radius √(60² + 20² + 6²)/2
  const box = { min: [0, 0, 0] as [number, number, number], max: [60, 20, 6] as [number, number, number] }
  const radius = Math.hypot(60, 20, 6) / 2

  it('aims at the box centre from the view direction, far enough for the sphere to fit the vertical field of view', () => {
    const fit = fitCamera(box, 35, 16 / 9, 1, [0, 0, 1])
    expect(fit.target).toEqual([30, 10, 3])
    expect(fit.radius).toBeCloseTo(radius, 12)
    // a sphere of radius r fills a half-angle θ at distance r / sin θ (wide view: θ = half the vertical field)
    const expected = radius / Math.sin((35 / 2) * Math.PI / 180)
    expect(fit.distance).toBeCloseTo(expected, 9)
    expect(fit.position[2] - fit.target[2]).toBeCloseTo(expected, 9)
    expect(fit.near).toBeGreaterThan(0)
    expect(fit.near).toBeLessThan(fit.distance - radius)
    expect(fit.far).toBeGreaterThan(fit.distance + radius)
  })

  it('backs off for a tall, narrow view, where the horizontal field is the narrower one', () => {
    const aspect = 0.5
    const fit = fitCamera(box, 35, aspect, 1.15)
    const hHalf = Math.atan(Math.tan((35 / 2) * Math.PI / 180) * aspect)
    expect(fit.distance).toBeCloseTo((radius * 1.15) / Math.sin(hHalf), 9)
    const away = Math.hypot(...fit.position.map((p, i) => p - fit.target[i]))
    expect(away).toBeCloseTo(fit.distance, 9)
  })
})
