import { onMounted, ref, shallowRef } from 'vue'
import { ApiError, usersApi, type User, asApiError } from '@/api'
import type { GrantableRole } from '@/api/types'

/** Why a user's role cannot be changed here, or null when it can. */
export function roleLockReason(user: Pick<User, 'id' | 'role'>, selfId: number | null): string | null {
  if (user.id === selfId) return 'Your own role'
  if (user.role === 'admin') return 'Admins are not changed here'
  return null
}

export const grantableRoles: readonly GrantableRole[] = ['engineer', 'contributor', 'librarian']

/** The people list and role changes for the admin page. */
export function useUserAdmin() {
  const users = shallowRef<User[]>([])
  const loading = ref(true)
  const error = shallowRef<ApiError | null>(null)
  const savingId = ref<number | null>(null)

  async function load() {
    loading.value = true
    error.value = null
    try {
      users.value = await usersApi.list()
    } catch (e) {
      error.value = asApiError(e)
    } finally {
      loading.value = false
    }
  }

  /** Changes a role; resolves with the updated user, rejects with the ApiError. */
  async function setRole(user: User, role: GrantableRole): Promise<User> {
    savingId.value = user.id
    try {
      const updated = await usersApi.setRole(user.id, role)
      users.value = users.value.map((u) => (u.id === updated.id ? updated : u))
      return updated
    } finally {
      savingId.value = null
    }
  }

  onMounted(load)
  return { users, loading, error, savingId, load, setRole }
}
