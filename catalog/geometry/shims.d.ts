// @jscad/stl-serializer ships no types.
declare module '@jscad/stl-serializer' {
  const serializer: {
    serialize: (options: { binary?: boolean }, ...objects: unknown[]) => ArrayBuffer[] | string[]
    mimeType: string
  }
  export default serializer
}

// @jscad/dxf-serializer ships no types.
declare module '@jscad/dxf-serializer' {
  const serializer: {
    serialize: (options: { geom2To?: 'lwpolyline' | 'polyline'; geom3To?: '3dface' | 'polyline' }, ...objects: unknown[]) => string[]
    mimeType: string
  }
  export default serializer
}
