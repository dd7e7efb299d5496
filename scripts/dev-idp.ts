/**
 * A local OpenID Connect identity provider for development and tests, on oidc-provider:
 * `npm run dev:idp` serves it at http://127.0.0.1:$FLEXSHELF_IDP_PORT (3100). One client,
 * `flexshelf-dev` / `flexshelf-dev-secret`, and a few invented people in groups, each with the
 * password `idp-dev-password`. Never for production: the keys are made at start and forgotten.
 *
 * Point Flexshelf at it with
 *   FLEXSHELF_OIDC_ISSUER=http://127.0.0.1:3100 FLEXSHELF_OIDC_CLIENT_ID=flexshelf-dev
 *   FLEXSHELF_OIDC_CLIENT_SECRET=flexshelf-dev-secret
 *   FLEXSHELF_OIDC_ROLES='{"flexshelf-admins":"admin","flexshelf-librarians":"librarian","flexshelf-contributors":"contributor"}'
 * The redirect URLs it accepts are FLEXSHELF_IDP_REDIRECT_URIS (comma-separated), by default
 * the development server's callback on port 3000.
 */
import { generateKeyPairSync } from 'node:crypto'
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http'
import Provider, { type Configuration } from 'oidc-provider'

export const IDP_PASSWORD = 'idp-dev-password'

/** Invented people; the groups are what FLEXSHELF_OIDC_ROLES maps to roles. */
export const IDP_PEOPLE = [
  { sub: 'u-1001', email: 'noor.halvorsen@idp.flexshelf.test', name: 'Noor Halvorsen', groups: ['flexshelf-admins', 'staff'] },
  { sub: 'u-1002', email: 'tobin.achterberg@idp.flexshelf.test', name: 'Tobin Achterberg', groups: ['flexshelf-librarians', 'staff'] },
  { sub: 'u-1003', email: 'priya.castellane@idp.flexshelf.test', name: 'Priya Castellane', groups: ['flexshelf-contributors', 'staff'] },
  { sub: 'u-1004', email: 'mateo.vrana@idp.flexshelf.test', name: 'Mateo Vrana', groups: ['staff'] },
  // an address the provider has not confirmed: Flexshelf must refuse to link it
  { sub: 'u-1005', email: 'unverified@idp.flexshelf.test', name: 'Ines Unverified', groups: ['staff'], emailVerified: false },
] as const

const escapeHtml = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`)

function page(title: string, body: string): string {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>${title}</title>
<style>body{font:16px system-ui,sans-serif;background:#eef1ef;color:#1d2320;display:grid;place-items:center;min-height:100vh;margin:0}
main{background:#fff;padding:28px 32px;border-radius:10px;box-shadow:0 1px 4px #0002;width:360px}h1{font-size:1.25rem;margin:0 0 4px}
p{color:#55605b;margin:0 0 18px;font-size:.9rem}label{display:block;font-size:.85rem;margin:12px 0 4px}input{width:100%;box-sizing:border-box;padding:8px;border:1px solid #b9c2bd;border-radius:6px;font:inherit}
button{margin-top:18px;width:100%;padding:9px;border:0;border-radius:6px;background:#2f5d50;color:#fff;font:inherit;cursor:pointer}.err{color:#a3322a}</style></head>
<body><main>${body}</main></body></html>`
}

function loginForm(uid: string, error = ''): string {
  return page('Sign in · development identity provider', `<h1>Development identity provider</h1>
<p>For trying single sign-on locally. Invented accounts; password <code>${IDP_PASSWORD}</code>.</p>
${error ? `<p class="err" role="alert">${escapeHtml(error)}</p>` : ''}
<form method="post" action="/interaction/${escapeHtml(uid)}/login">
<label for="login">E-mail</label><input id="login" name="login" type="email" autocomplete="username" required>
<label for="password">Password</label><input id="password" name="password" type="password" autocomplete="current-password" required>
<button type="submit">Continue</button></form>`)
}

async function readForm(req: IncomingMessage): Promise<URLSearchParams> {
  let body = ''
  for await (const chunk of req) {
    body += chunk
    if (body.length > 10_000) break
  }
  return new URLSearchParams(body)
}

export interface IdpOptions {
  port: number
  redirectUris: string[]
}

export async function startIdp(options: IdpOptions): Promise<{ issuer: string; close: () => Promise<void> }> {
  // 127.0.0.1 rather than localhost: Node may resolve localhost to ::1, where nothing listens
  const issuer = `http://127.0.0.1:${options.port}`
  const { privateKey } = generateKeyPairSync('rsa', { modulusLength: 2048 })
  const jwk = { ...privateKey.export({ format: 'jwk' }), use: 'sig', alg: 'RS256', kid: 'dev-idp-1' }
  const configuration: Configuration = {
    clients: [{
      client_id: 'flexshelf-dev',
      client_secret: 'flexshelf-dev-secret',
      redirect_uris: options.redirectUris,
      grant_types: ['authorization_code'],
      response_types: ['code'],
      token_endpoint_auth_method: 'client_secret_basic',
    }],
    jwks: { keys: [jwk as never] },
    claims: { openid: ['sub'], email: ['email', 'email_verified'], profile: ['name'], groups: ['groups'] },
    scopes: ['openid', 'email', 'profile', 'groups'],
    pkce: { required: () => true },
    features: { devInteractions: { enabled: false } },
    cookies: { keys: [generateKeyPairSync('ed25519').publicKey.export({ format: 'der', type: 'spki' }).toString('base64')] },
    interactions: { url: (_ctx: unknown, interaction: { uid: string }) => `/interaction/${interaction.uid}` },
    async findAccount(_ctx: unknown, sub: string) {
      const person = IDP_PEOPLE.find((p) => p.sub === sub)
      if (!person) return undefined
      return {
        accountId: sub,
        claims: async () => ({ sub, email: person.email, email_verified: !('emailVerified' in person && person.emailVerified === false), name: person.name, groups: [...person.groups] }),
      }
    },
    // a first-party development client: no consent screen
    // eslint-disable-next-line @typescript-eslint/no-explicit-any
    async loadExistingGrant(ctx: any) {
      const grantId = ctx.oidc.result?.consent?.grantId || ctx.oidc.session!.grantIdFor(ctx.oidc.client!.clientId)
      if (grantId) return ctx.oidc.provider.Grant.find(grantId)
      const grant = new ctx.oidc.provider.Grant({ clientId: ctx.oidc.client!.clientId, accountId: ctx.oidc.session!.accountId! })
      grant.addOIDCScope('openid email profile groups')
      await grant.save()
      return grant
    },
    ttl: { Session: 3600, Interaction: 600, Grant: 3600, AccessToken: 600, IdToken: 600, AuthorizationCode: 60 },
  }
  const provider = new Provider(issuer, configuration)
  const handle = provider.callback()

  async function interaction(req: IncomingMessage, res: ServerResponse, uid: string, action: string | undefined) {
    const details = await provider.interactionDetails(req, res)
    if (details.uid !== uid) throw new Error('interaction mismatch')
    if (req.method === 'GET' && !action) {
      res.writeHead(200, { 'Content-Type': 'text/html; charset=utf-8' }).end(loginForm(uid))
      return
    }
    if (req.method === 'POST' && action === 'login') {
      const form = await readForm(req)
      const person = IDP_PEOPLE.find((p) => p.email === (form.get('login') ?? '').trim().toLowerCase())
      if (!person || form.get('password') !== IDP_PASSWORD) {
        res.writeHead(200, { 'Content-Type': 'text/html; charset=utf-8' }).end(loginForm(uid, 'Unknown e-mail or wrong password.'))
        return
      }
      await provider.interactionFinished(req, res, { login: { accountId: person.sub } }, { mergeWithLastSubmission: false })
      return
    }
    res.writeHead(405).end()
  }

  const server = createServer((req, res) => {
    const m = /^\/interaction\/([A-Za-z0-9_-]+)(?:\/(login))?$/.exec(new URL(req.url ?? '/', issuer).pathname)
    if (m) {
      interaction(req, res, m[1], m[2]).catch((err) => {
        res.writeHead(400, { 'Content-Type': 'text/html; charset=utf-8' }).end(page('Sign-in failed', `<h1>Sign-in failed</h1><p>${escapeHtml(String((err as Error).message))}</p>`))
      })
      return
    }
    handle(req, res)
  })
  await new Promise<void>((resolve) => server.listen(options.port, '127.0.0.1', resolve))
  return { issuer, close: () => new Promise((resolve) => server.close(() => resolve())) }
}

// run as `npm run dev:idp`
if (import.meta.url === `file://${process.argv[1]}`) {
  const port = Number(process.env.FLEXSHELF_IDP_PORT || 3100)
  const redirectUris = (process.env.FLEXSHELF_IDP_REDIRECT_URIS || 'http://localhost:3000/api/auth/oidc/callback,http://127.0.0.1:3000/api/auth/oidc/callback')
    .split(',').map((u) => u.trim()).filter(Boolean)
  startIdp({ port, redirectUris }).then(({ issuer }) => {
    console.log(`Development identity provider at ${issuer} (client flexshelf-dev / flexshelf-dev-secret; password ${IDP_PASSWORD})`)
    for (const p of IDP_PEOPLE) console.log(`  ${p.email.padEnd(40)} ${p.groups.join(', ')}`)
    const stop = () => process.exit(0)
    process.on('SIGINT', stop)
    process.on('SIGTERM', stop)
  }, (err) => {
    console.error('The development identity provider cannot start:', err)
    process.exit(1)
  })
}
