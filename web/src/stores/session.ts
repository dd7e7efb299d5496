import { defineStore } from 'pinia'
import { computed, ref } from 'vue'
import { authApi, setAuthToken, setUnauthenticatedHandler, type User } from '@/api'
import { hasRole } from '@/router/access'
import type { Role } from '@/api/types'

const TOKEN_KEY = 'flexshelf.token'

/** Who is signed in; shared by the nav bar, the route guard and every view. */
export const useSessionStore = defineStore('session', () => {
  const user = ref<User | null>(null)
  const token = ref<string | null>(null)
  let restoring: Promise<void> | null = null

  const signedIn = computed(() => user.value !== null)
  const role = computed<Role | null>(() => user.value?.role ?? null)

  function adopt(next: { token: string; user: User } | null) {
    token.value = next?.token ?? null
    user.value = next?.user ?? null
    setAuthToken(token.value)
    if (token.value) localStorage.setItem(TOKEN_KEY, token.value)
    else localStorage.removeItem(TOKEN_KEY)
  }

  /** Restores the session from a stored token once; later calls wait on the same promise. */
  function restore(): Promise<void> {
    restoring ??= (async () => {
      setUnauthenticatedHandler(() => adopt(null))
      const stored = localStorage.getItem(TOKEN_KEY)
      if (!stored) return
      setAuthToken(stored)
      try {
        adopt({ token: stored, user: await authApi.me() })
      } catch {
        // an expired or revoked token simply means signing in again
        adopt(null)
      }
    })()
    return restoring
  }

  async function signIn(email: string, password: string) {
    adopt(await authApi.signIn(email, password))
  }

  /** Finishes a single sign-on: the server hands the session over once. */
  async function signInWithSso() {
    adopt(await authApi.ssoSession())
  }

  /** After the password change the session carries on; the one-time password flag is gone. */
  function passwordChanged() {
    if (user.value) user.value = { ...user.value, mustChangePassword: false }
  }

  async function signUp(email: string, password: string, displayName: string) {
    adopt(await authApi.signUp(email, password, displayName))
  }

  async function signOut() {
    try {
      await authApi.signOut()
    } finally {
      adopt(null)
    }
  }

  function can(required: Role) {
    return hasRole(role.value, required)
  }

  return { user, token, signedIn, role, restore, signIn, signInWithSso, passwordChanged, signUp, signOut, can }
})
