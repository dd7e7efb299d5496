/**
 * The built web app (vite writes it to dist/web) with history-mode fallback to index.html.
 * Without a build, every page explains how to make one.
 */
import { existsSync } from 'node:fs'
import { join } from 'node:path'
import express, { type Express, type Request, type Response } from 'express'

const MISSING_BUILD_TEXT = [
  'Flexshelf: the web app has not been built yet.',
  '',
  'Run `npm run build` (or simply `npm start`, which builds first) and reload this page.',
  'The API is running: see /api/health.',
  '',
].join('\n')

export function serveWebApp(app: Express, webDir: string): void {
  const indexFile = join(webDir, 'index.html')
  if (!existsSync(indexFile)) {
    app.get('/{*splat}', function missingBuild(_req: Request, res: Response) {
      res.status(503).type('text/plain').send(MISSING_BUILD_TEXT)
    })
    return
  }
  // hashed assets may be cached for long; index.html must always be fresh
  app.use(express.static(webDir, {
    index: false,
    setHeaders: (res, path) => {
      if (path.includes(`${join(webDir, 'assets')}`)) res.setHeader('Cache-Control', 'public, max-age=31536000, immutable')
    },
  }))
  app.get('/{*splat}', function spaFallback(_req: Request, res: Response) {
    res.setHeader('Cache-Control', 'no-cache')
    res.sendFile(indexFile)
  })
}
