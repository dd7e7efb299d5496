import { createRouter, createWebHistory } from 'vue-router'
import ShelfView from '@/views/ShelfView.vue'
import { useSessionStore } from '@/stores/session'
import { decideAccess, type RouteAccess } from './access'

declare module 'vue-router' {
  interface RouteMeta extends RouteAccess {
    title?: string
  }
}

const router = createRouter({
  history: createWebHistory(import.meta.env.BASE_URL),
  routes: [
    { path: '/', name: 'shelf', component: ShelfView, meta: { role: 'engineer', title: 'Shelf' } },
    // route level code-splitting: each view below is loaded when it is first visited
    { path: '/signin', name: 'signin', component: () => import('@/views/SignInView.vue'), meta: { public: true, guestOnly: true, title: 'Sign in' } },
    { path: '/forgot-password', name: 'forgot-password', component: () => import('@/views/ForgotPasswordView.vue'), meta: { public: true, guestOnly: true, title: 'Reset your password' } },
    { path: '/reset-password', name: 'reset-password', component: () => import('@/views/ResetPasswordView.vue'), meta: { public: true, title: 'Choose a new password' } },
    { path: '/account/password', name: 'account-password', component: () => import('@/views/AccountPasswordView.vue'), meta: { role: 'engineer', title: 'Password' } },
    { path: '/search', name: 'search', component: () => import('@/views/SearchView.vue'), meta: { role: 'engineer', title: 'Search' } },
    { path: '/entries/:id(\\d+)', name: 'entry', component: () => import('@/views/EntryView.vue'), meta: { role: 'engineer', title: 'Entry' } },
    { path: '/entries/:id(\\d+)/configure', name: 'configure', component: () => import('@/views/ConfigureView.vue'), meta: { role: 'engineer', title: 'Configure' } },
    { path: '/entries/:id(\\d+)/datasheet', name: 'datasheet', component: () => import('@/views/DataSheetView.vue'), meta: { role: 'engineer', title: 'Data sheet' } },
    { path: '/compare', name: 'compare', component: () => import('@/views/CompareView.vue'), meta: { role: 'engineer', title: 'Compare' } },
    { path: '/configurations', name: 'configurations', component: () => import('@/views/ConfigurationsView.vue'), meta: { role: 'engineer', title: 'My configurations' } },
    { path: '/shared/:token', name: 'shared', component: () => import('@/views/ConfigureView.vue'), meta: { role: 'engineer', title: 'Shared configuration' } },
    { path: '/entries/:id(\\d+)/propose', name: 'propose-change', component: () => import('@/views/ProposeView.vue'), meta: { role: 'contributor', title: 'Propose a change' } },
    { path: '/proposals', name: 'proposals', component: () => import('@/views/MyProposalsView.vue'), meta: { role: 'contributor', title: 'Your proposals' } },
    { path: '/proposals/:id(\\d+)', name: 'proposal', component: () => import('@/views/ProposeView.vue'), meta: { role: 'contributor', title: 'Proposal' } },
    { path: '/propose', name: 'propose', component: () => import('@/views/ProposeView.vue'), meta: { role: 'contributor', title: 'Propose an entry' } },
    { path: '/review', name: 'review', component: () => import('@/views/ReviewQueueView.vue'), meta: { role: 'librarian', title: 'Review' } },
    { path: '/review/:id(\\d+)', name: 'review-entry', component: () => import('@/views/ReviewEntryView.vue'), meta: { role: 'librarian', title: 'Review a proposal' } },
    { path: '/admin/outbox', name: 'admin-outbox', component: () => import('@/views/OutboxView.vue'), meta: { role: 'admin', title: 'Outbox' } },
    { path: '/admin/audit', name: 'admin-audit', component: () => import('@/views/AdminAuditView.vue'), meta: { role: 'admin', title: 'Audit log' } },
    { path: '/admin/users', name: 'admin-users', component: () => import('@/views/AdminUsersView.vue'), meta: { role: 'admin', title: 'People and roles' } },
    { path: '/forbidden', name: 'forbidden', component: () => import('@/views/ForbiddenView.vue'), meta: { public: true, title: 'Not for your role' } },
    { path: '/:pathMatch(.*)*', name: 'not-found', component: () => import('@/views/NotFoundView.vue'), meta: { public: true, title: 'Not found' } },
  ],
})

router.beforeEach(async (to) => {
  const session = useSessionStore()
  await session.restore()
  const decision = decideAccess(to.meta, session.role, to.fullPath)
  // a one-time password is replaced before anything else (the server refuses the rest too)
  if (decision.kind === 'allow' && session.user?.mustChangePassword && !to.meta.public && to.name !== 'account-password') return { name: 'account-password' }
  switch (decision.kind) {
    case 'allow': return true
    case 'home': return { name: 'shelf' }
    case 'sign-in': return { name: 'signin', query: { redirect: decision.redirect } }
    case 'forbidden': return { name: 'forbidden', query: { from: to.fullPath, needs: decision.required } }
  }
})

router.afterEach((to) => {
  document.title = to.meta.title ? `${to.meta.title} · Flexshelf` : 'Flexshelf'
})

export default router
