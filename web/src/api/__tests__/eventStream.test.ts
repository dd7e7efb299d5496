import { describe, expect, it } from 'vitest'
import { EventStreamParser } from '@/api/eventStream'

// The text/event-stream format (WHATWG HTML Living Standard, "Server-sent events", §9.2.6).
describe('EventStreamParser', () => {
  it('reads named events with JSON data, split across chunks anywhere', () => {
    const parser = new EventStreamParser()
    const text = 'event: progress\ndata: {"done":1,"total":4}\n\n: still searching\n\nevent: result\ndata: {"results":[]}\n\n'
    const observed = []
    for (let i = 0; i < text.length; i += 7) observed.push(...parser.push(text.slice(i, i + 7)))
    expect(observed).toEqual([{ event: 'progress', data: { done: 1, total: 4 } }, { event: 'result', data: { results: [] } }])
  })

  it('joins multi-line data, defaults the event name to "message" and accepts CRLF', () => {
    const parser = new EventStreamParser()
    expect(parser.push('data: one\r\ndata: two\r\n\r\n')).toEqual([{ event: 'message', data: 'one\ntwo' }])
  })

  it('holds a partial event until its blank line arrives', () => {
    const parser = new EventStreamParser()
    expect(parser.push('event: cancelled\ndata: {"id":"a"}\n')).toEqual([])
    expect(parser.push('\n')).toEqual([{ event: 'cancelled', data: { id: 'a' } }])
  })
})
