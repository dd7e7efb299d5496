/**
 * A free TCP port on loopback, for the servers that tests and benchmarks start themselves
 * (the app, PostgreSQL, Redis, the fake bucket, the identity provider): listen on port 0,
 * read the port the system gave, close.
 */
import { createServer } from 'node:net'

export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = createServer()
    server.unref()
    server.once('error', reject)
    server.listen(0, '127.0.0.1', () => {
      const address = server.address()
      const port = typeof address === 'object' && address ? address.port : 0
      server.close(() => resolve(port))
    })
  })
}
