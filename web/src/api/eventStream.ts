/**
 * Reads a text/event-stream response with fetch (EventSource cannot send the bearer token).
 * The parser is incremental and pure, so it is tested without a network.
 */
import { ApiError, authorizationHeaders, parseErrorBody } from './client'

export interface StreamEvent {
  event: string
  data: unknown
}

/** Feeds chunks in, gets whole events out; a partial event waits for the next chunk. */
export class EventStreamParser {
  private buffer = ''

  push(chunk: string): StreamEvent[] {
    this.buffer += chunk.replace(/\r\n?/g, '\n')
    const events: StreamEvent[] = []
    let end: number
    while ((end = this.buffer.indexOf('\n\n')) >= 0) {
      const block = this.buffer.slice(0, end)
      this.buffer = this.buffer.slice(end + 2)
      let event = 'message'
      const data: string[] = []
      for (const line of block.split('\n')) {
        if (line.startsWith(':')) continue // a comment: the server's heartbeat
        const colon = line.indexOf(':')
        const field = colon < 0 ? line : line.slice(0, colon)
        const value = colon < 0 ? '' : line.slice(colon + 1).replace(/^ /, '')
        if (field === 'event') event = value
        else if (field === 'data') data.push(value)
      }
      if (!data.length) continue
      const text = data.join('\n')
      let parsed: unknown = text
      try { parsed = JSON.parse(text) } catch { /* plain text data stays text */ }
      events.push({ event, data: parsed })
    }
    return events
  }
}

/** Follows an event stream until the server ends it (or `signal` aborts); errors as ApiError. */
export async function followEventStream(path: string, onEvent: (event: StreamEvent) => void, signal?: AbortSignal): Promise<void> {
  let response: Response
  try {
    response = await fetch(path, { headers: { Accept: 'text/event-stream', ...authorizationHeaders() }, signal })
  } catch (cause) {
    if (cause instanceof DOMException && cause.name === 'AbortError') throw cause
    throw new ApiError(0, 'network', 'The server cannot be reached. Check the connection and try again.')
  }
  if (!response.ok) throw parseErrorBody(response.status, await response.text())
  if (!response.body) throw new ApiError(response.status, 'bad_response', 'The server sent no event stream.')
  const reader = response.body.pipeThrough(new TextDecoderStream()).getReader()
  const parser = new EventStreamParser()
  for (;;) {
    const { value, done } = await reader.read()
    if (done) return
    for (const event of parser.push(value)) onEvent(event)
  }
}
