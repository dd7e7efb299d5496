/**
 * The registry of module families: the shelf's built-in families in their order, and any a
 * caller registers (a test's made-up family, a plug-in). Everything that needs a family by id —
 * evaluate, geometry, search, tolerance bands, the design map, the API — finds it here.
 */
import { builtinFamilies } from './families'
import type { FamilyDefinition } from './schema/types'

const registered: FamilyDefinition[] = [...builtinFamilies]

/** The families on the shelf, built-in ones first (a live view: registering adds to it). */
export const families: readonly FamilyDefinition[] = registered

export class UnknownFamilyError extends Error {
  readonly familyId: string
  constructor(familyId: string) {
    super(`unknown module family "${familyId}"; known: ${registered.map((f) => f.id).join(', ')}`)
    this.name = 'UnknownFamilyError'
    this.familyId = familyId
  }
}

/** The family with this id, or undefined. */
export function findFamily(familyId: string): FamilyDefinition | undefined {
  return registered.find((f) => f.id === familyId)
}

export function getFamily(familyId: string): FamilyDefinition {
  const family = findFamily(familyId)
  if (!family) throw new UnknownFamilyError(familyId)
  return family
}

/**
 * Adds a family (made with defineFamily) after the built-in ones; returns the function that
 * takes it off again. An id already registered is refused, so a family cannot be replaced
 * behind the back of what already holds it.
 */
export function registerFamily(family: FamilyDefinition): () => void {
  if (findFamily(family.id)) throw new Error(`a module family "${family.id}" is already registered`)
  registered.push(family)
  return () => {
    const at = registered.indexOf(family)
    if (at >= 0) registered.splice(at, 1)
  }
}
