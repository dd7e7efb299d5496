/**
 * The three.js side of the 3D preview: one renderer, scene, material and orbit controls for the
 * life of the component, a new BufferGeometry for each rebuilt part (the old one disposed), the
 * camera fitted to the part, a render only when something changed (no animation loop, so an
 * idle preview costs nothing), and everything disposed when the component goes.
 */
import { onBeforeUnmount, shallowRef, type Ref } from 'vue'
import {
  AmbientLight, BufferAttribute, BufferGeometry, Color, DirectionalLight, HemisphereLight, Mesh, MeshStandardMaterial,
  PerspectiveCamera, Scene, WebGLRenderer,
} from 'three'
import { OrbitControls } from 'three/examples/jsm/controls/OrbitControls.js'
import { boundingBox, fitCamera, VIEW_DIRECTION, type Box3, type Vec3 } from './previewGeometry'

const FOV = 35

export function usePartPreview(canvas: Ref<HTMLCanvasElement | null>, host: Ref<HTMLElement | null>) {
  const unavailable = shallowRef<string | null>(null)
  const box = shallowRef<Box3 | null>(null)
  let renderer: WebGLRenderer | null = null
  let controls: OrbitControls | null = null
  let observer: ResizeObserver | null = null
  const scene = new Scene()
  const camera = new PerspectiveCamera(FOV, 1, 0.1, 1000)
  camera.up.set(0, 0, 1) // the build plate is XY; Z is up out of it
  const material = new MeshStandardMaterial({ color: 0x8a9aa5, roughness: 0.62, metalness: 0.05, flatShading: true })
  let mesh: Mesh | null = null

  scene.add(new AmbientLight(0xffffff, 0.35))
  scene.add(new HemisphereLight(0xffffff, 0x445566, 0.9))
  const key = new DirectionalLight(0xffffff, 1.6)
  key.position.set(0.6, -1, 1.4)
  scene.add(key)
  const rim = new DirectionalLight(0xffffff, 0.5)
  rim.position.set(-1, 0.8, 0.4)
  scene.add(rim)

  function render() {
    if (renderer) renderer.render(scene, camera)
  }

  /** Creates the renderer; false (with a message) when the browser gives no WebGL context. */
  function start(): boolean {
    const el = canvas.value
    if (!el) return false
    try {
      renderer = new WebGLRenderer({ canvas: el, antialias: true, alpha: false, preserveDrawingBuffer: true })
    } catch {
      unavailable.value = 'This browser cannot draw the 3D preview: WebGL is turned off or not supported here. The curve, the checks and the STL download are not affected.'
      return false
    }
    renderer.setPixelRatio(Math.min(window.devicePixelRatio || 1, 2))
    controls = new OrbitControls(camera, el)
    controls.addEventListener('change', render)
    observer = new ResizeObserver(resize)
    if (host.value) observer.observe(host.value)
    resize()
    return true
  }

  function resize() {
    const el = host.value
    if (!renderer || !el) return
    const width = Math.max(1, el.clientWidth)
    const height = Math.max(1, el.clientHeight)
    renderer.setSize(width, height, false)
    camera.aspect = width / height
    camera.updateProjectionMatrix()
    render()
  }

  function setBackground(hex: string, part: string) {
    scene.background = new Color(hex)
    material.color = new Color(part)
    render()
  }

  /** Puts the camera back in front of the part; keeps the current direction unless told. */
  function fit(direction?: Vec3) {
    const b = box.value
    if (!b || !controls) return
    const dir = direction ?? (camera.position.distanceTo(controls.target) > 0
      ? (camera.position.clone().sub(controls.target).toArray() as Vec3)
      : VIEW_DIRECTION)
    const f = fitCamera(b, FOV, camera.aspect, 1.12, dir)
    camera.position.set(...f.position)
    camera.near = f.near
    camera.far = f.far
    camera.updateProjectionMatrix()
    controls.target.set(...f.target)
    controls.minDistance = f.radius * 0.3
    controls.maxDistance = f.distance * 4
    controls.update()
    render()
  }

  /** Shows a new part: the old geometry is disposed; the first part sets the default view. */
  function show(positions: Float32Array) {
    const first = mesh === null
    const geometry = new BufferGeometry()
    geometry.setAttribute('position', new BufferAttribute(positions, 3))
    geometry.computeVertexNormals()
    if (mesh) {
      mesh.geometry.dispose()
      mesh.geometry = geometry
    } else {
      mesh = new Mesh(geometry, material)
      scene.add(mesh)
    }
    box.value = boundingBox(positions)
    fit(first ? VIEW_DIRECTION : undefined)
  }

  function dispose() {
    observer?.disconnect()
    observer = null
    controls?.removeEventListener('change', render)
    controls?.dispose()
    controls = null
    if (mesh) {
      scene.remove(mesh)
      mesh.geometry.dispose()
      mesh = null
    }
    material.dispose()
    renderer?.forceContextLoss()
    renderer?.dispose()
    renderer = null
  }

  onBeforeUnmount(dispose)

  return { start, show, fit, setBackground, unavailable, box, dispose }
}
