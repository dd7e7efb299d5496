// oidc-provider ships no type declarations; the development identity provider uses a small part of it
declare module 'oidc-provider' {
  // eslint-disable-next-line @typescript-eslint/no-explicit-any
  export type Configuration = Record<string, any>
  // eslint-disable-next-line @typescript-eslint/no-explicit-any
  const Provider: new (issuer: string, configuration: Configuration) => any
  export default Provider
}
