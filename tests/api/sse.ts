/** A supertest parser for text/event-stream bodies: the events in order, data parsed as JSON. */
import type { Response } from 'superagent'

export interface StreamEvent {
  event: string
  data: unknown
}

export function parseEventStream(text: string): StreamEvent[] {
  const events: StreamEvent[] = []
  for (const block of text.split('\n\n')) {
    let event = 'message'
    const data: string[] = []
    for (const line of block.split('\n')) {
      if (line.startsWith('event: ')) event = line.slice(7)
      else if (line.startsWith('data: ')) data.push(line.slice(6))
    }
    if (data.length) events.push({ event, data: JSON.parse(data.join('\n')) })
  }
  return events
}

export function readEvents(res: Response, done: (err: Error | null, body: StreamEvent[]) => void): void {
  let text = ''
  res.setEncoding('utf8')
  res.on('data', (chunk: string) => { text += chunk })
  res.on('end', () => done(null, parseEventStream(text)))
}
