import { describe, expect, it } from 'vitest'
import { queuePageSpan } from '../useReview'

// Paging arithmetic, judged by counting rows by hand (common practice: 1-based "first–last of total").
describe('review queue pages', () => {
  it('shows everything on one page when it fits', () => {
    expect(queuePageSpan(0, 50, 12)).toEqual({ first: 1, last: 12, total: 12, hasPrevious: false, hasNext: false })
  })
  it('an empty queue has no rows and no pages to move to', () => {
    expect(queuePageSpan(0, 50, 0)).toEqual({ first: 0, last: 0, total: 0, hasPrevious: false, hasNext: false })
  })
  it('a long queue is walked 50 at a time to its last partial page', () => {
    const pages = [0, 50, 100].map((offset) => queuePageSpan(offset, 50, 130))
    expect(pages.map((p) => [p.first, p.last])).toEqual([[1, 50], [51, 100], [101, 130]])
    expect(pages.map((p) => [p.hasPrevious, p.hasNext])).toEqual([[false, true], [true, true], [true, false]])
  })
  it('a page past the end of a shorter list holds none of it', () => {
    expect(queuePageSpan(50, 50, 3)).toEqual({ first: 0, last: 0, total: 3, hasPrevious: true, hasNext: false })
  })
  it('exactly a page is one page, not two', () => {
    expect(queuePageSpan(0, 50, 50).hasNext).toBe(false)
  })
})
