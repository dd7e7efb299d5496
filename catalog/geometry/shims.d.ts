// @jscad/stl-serializer ships no types.
declare module '@jscad/stl-serializer' {
  const serializer: {
    serialize: (options: { binary?: boolean }, ...objects: unknown[]) => ArrayBuffer[] | string[]
    mimeType: string
  }
  export default serializer
}
