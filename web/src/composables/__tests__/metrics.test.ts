import { describe, expect, it } from 'vitest'
import { formatMetric, formatNumber, insideWindow, keyMetricSpec } from '../metrics'
import type { MetricSpec } from '@/api/types'

const bistableMetrics: MetricSpec[] = [
  { key: 'bistable', label: 'Bistable', unit: 'boolean' },
  { key: 'valleyForce', label: 'Valley force', unit: 'N' },
  { key: 'peakForce', label: 'Peak force', unit: 'N' },
]

describe('keyMetricSpec', () => {
  it('picks peak force for a bistable family', () => {
    expect(keyMetricSpec({ kind: 'bistable', metrics: bistableMetrics })?.key).toBe('peakForce')
  })
  it('picks rotational stiffness for a hinge', () => {
    expect(keyMetricSpec({ kind: 'hinge', metrics: [{ key: 'maxStrain', label: 'Max strain', unit: '' }, { key: 'rotationalStiffness', label: 'Rotational stiffness', unit: 'N·mm/deg' }] })?.key).toBe('rotationalStiffness')
  })
  it('falls back to the first metric with a unit', () => {
    expect(keyMetricSpec({ kind: 'latch', metrics: [{ key: 'bistable', label: 'x', unit: 'boolean' }, { key: 'ratio', label: 'r', unit: '' }, { key: 'retentionForce', label: 'Retention', unit: 'N' }] })?.key).toBe('retentionForce')
  })
  it('answers null without a family', () => {
    expect(keyMetricSpec(undefined)).toBeNull()
  })
})

describe('formatNumber', () => {
  it.each([
    [4.2137, '4.21'],
    [0.012345, '0.0123'],
    [123.456, '123'],
    [12345.6, '12,346'],
    [-0.5, '−0.5'],
    [0, '0'],
    [2, '2'],
    [Number.NaN, '—'],
  ])('%s → %s', (value, expected) => {
    expect(formatNumber(value)).toBe(expected)
  })
})

describe('formatMetric', () => {
  it('writes numbers with their unit, flags as words and null as a dash', () => {
    expect(formatMetric(3.456, { unit: 'N' })).toBe('3.46 N')
    expect(formatMetric(true, { unit: 'boolean' })).toBe('Yes')
    expect(formatMetric(null, { unit: 'mm' })).toBe('—')
    expect(formatMetric(1.5, { unit: '' })).toBe('1.5')
  })
})

describe('insideWindow', () => {
  it('checks both bounds inclusively', () => {
    expect(insideWindow(3, { min: 3, max: 5 })).toBe(true)
    expect(insideWindow(5.01, { min: 3, max: 5 })).toBe(false)
  })
  it('allows an open end', () => {
    expect(insideWindow(100, { min: 3, max: null })).toBe(true)
    expect(insideWindow(1, { min: null, max: 0.5 })).toBe(false)
  })
  it('is false without bounds or for non-numbers', () => {
    expect(insideWindow(3, { min: null, max: null })).toBe(false)
    expect(insideWindow(true, { min: 0, max: 5 })).toBe(false)
    expect(insideWindow(3, null)).toBe(false)
  })
})

describe('roleInSentence', () => {
  it('puts the right article before each role', async () => {
    const { roleInSentence } = await import('../labels')
    expect(roleInSentence('engineer')).toBe('an engineer')
    expect(roleInSentence('librarian')).toBe('a librarian')
    expect(roleInSentence('admin')).toBe('an admin')
  })
})
