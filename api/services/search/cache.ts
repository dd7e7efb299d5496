/** A bounded least-recently-used map: a Map keeps insertion order, so the first key is the oldest. */
export class LruCache<V> {
  private readonly map = new Map<string, V>()

  constructor(readonly capacity: number) {
    if (!(capacity >= 1)) throw new Error('capacity must be at least 1')
  }

  get(key: string): V | undefined {
    const value = this.map.get(key)
    if (value === undefined) return undefined
    this.map.delete(key)
    this.map.set(key, value)
    return value
  }

  set(key: string, value: V): void {
    this.map.delete(key)
    this.map.set(key, value)
    while (this.map.size > this.capacity) this.map.delete(this.map.keys().next().value as string)
  }

  clear(): void {
    this.map.clear()
  }

  get size(): number {
    return this.map.size
  }
}
