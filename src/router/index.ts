import { createRouter, createWebHistory } from 'vue-router';
import { useSessionStore } from '@/stores/session';
import { isPhoneWidth } from '@/composables/usePhoneWidth';
import { roleAtLeast, type Role } from '@shared/model/roles';

declare module 'vue-router' {
  interface RouteMeta {
    /** Signed-out visitors are sent to sign-in and brought back afterwards. */
    requiresAuth?: boolean;
    /** Pages for signed-out visitors only (a signed-in visitor goes home). */
    guestOnly?: boolean;
    title?: string;
    /** Least role in the current team; below it the visitor sees the 403 page. */
    minRole?: Role;
    /** What the role is needed for, in the 403 page's words ("manage members"). */
    action?: string;
  }
}

export const router = createRouter({
  history: createWebHistory(),
  routes: [
    { path: '/', name: 'home', component: () => import('@/views/HomeView.vue'), meta: { requiresAuth: true, title: 'Sketches' } },
    { path: '/sketches/:sketchId/studies', name: 'sketch-studies', component: () => import('@/views/StudyView.vue'), meta: { requiresAuth: true, title: 'Studies' }, props: true },
    { path: '/sketches/:sketchId/phone', name: 'sketch-phone', component: () => import('@/views/SketchPhoneView.vue'), meta: { requiresAuth: true, title: 'Sketch' }, props: true },
    { path: '/sketches/:sketchId', name: 'sketch', component: () => import('@/views/SketchView.vue'), meta: { requiresAuth: true, title: 'Sketch' }, props: true },
    { path: '/team/members', name: 'members', component: () => import('@/views/MembersView.vue'), meta: { requiresAuth: true, title: 'Members', minRole: 'owner', action: 'manage members' } },
    { path: '/dev/mailbox', name: 'mailbox', component: () => import('@/views/MailboxView.vue'), meta: { requiresAuth: true, title: 'Mailbox' } },
    { path: '/sign-in', name: 'sign-in', component: () => import('@/views/SignInView.vue'), meta: { guestOnly: true, title: 'Sign in' } },
    { path: '/sign-up', name: 'sign-up', component: () => import('@/views/SignUpView.vue'), meta: { guestOnly: true, title: 'Create an account' } },
    { path: '/confirm-sign-up', name: 'confirm-sign-up', component: () => import('@/views/ConfirmSignUpView.vue'), meta: { title: 'Finish signing up' } },
    { path: '/forgot-password', name: 'forgot-password', component: () => import('@/views/ForgotPasswordView.vue'), meta: { guestOnly: true, title: 'Forgot password' } },
    { path: '/reset-password', name: 'reset-password', component: () => import('@/views/ResetPasswordView.vue'), meta: { title: 'Choose a new password' } },
    { path: '/invitations/accept', name: 'accept-invitation', component: () => import('@/views/AcceptInvitationView.vue'), meta: { title: 'Join a team' } },
    { path: '/forbidden', name: 'forbidden', component: () => import('@/views/ForbiddenView.vue'), meta: { title: 'Not allowed' } },
    { path: '/:pathMatch(.*)*', name: 'not-found', component: () => import('@/views/NotFoundView.vue'), meta: { title: 'Not found' } },
  ],
});

router.beforeEach(async (to) => {
  const session = useSessionStore();
  if (!session.loaded) {
    try {
      await session.load();
    } catch {
      // The server is unreachable; let the page render and show its own error.
    }
  }
  if (to.meta.requiresAuth && !session.user) {
    return { name: 'sign-in', query: to.fullPath !== '/' ? { next: to.fullPath } : {} };
  }
  if (to.meta.guestOnly && session.user) return { name: 'home' };
  // A sketch on a phone-width screen (a mention e-mail's link, say) opens read-only, unless the
  // person asked for the full editor (?full=1).
  if (to.name === 'sketch' && to.query.full !== '1' && isPhoneWidth()) {
    return { name: 'sketch-phone', params: to.params, query: to.query, hash: to.hash };
  }
  if (to.meta.minRole && !roleAtLeast(session.role, to.meta.minRole)) {
    return { name: 'forbidden', query: { needed: to.meta.minRole, action: to.meta.action } };
  }
  return true;
});

router.afterEach((to) => {
  document.title = to.meta.title ? `${to.meta.title} · Shockwright` : 'Shockwright';
});
