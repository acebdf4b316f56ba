import type { RouteRecordRaw } from 'vue-router';

/** Every page of the app. Pages other than sign-in load on demand. */
export const routes: RouteRecordRaw[] = [
  { path: '/', redirect: '/sheets' },
  {
    path: '/sign-in',
    name: 'sign-in',
    component: () => import('@/views/SignInView.vue'),
    props: { initialMode: 'sign-in' },
    meta: { title: 'Sign in', public: true, guestOnly: true },
  },
  {
    path: '/sign-up',
    name: 'sign-up',
    component: () => import('@/views/SignInView.vue'),
    props: { initialMode: 'sign-up' },
    meta: { title: 'Sign up', public: true, guestOnly: true },
  },
  {
    path: '/confirm-sign-up',
    name: 'confirm-sign-up',
    component: () => import('@/views/ConfirmSignUpView.vue'),
    meta: { title: 'Finish signing up', public: true },
  },
  {
    path: '/forgot-password',
    name: 'forgot-password',
    component: () => import('@/views/ForgotPasswordView.vue'),
    meta: { title: 'Forgot password', public: true },
  },
  {
    path: '/reset-password',
    name: 'reset-password',
    component: () => import('@/views/ResetPasswordView.vue'),
    meta: { title: 'Choose a new password', public: true },
  },
  {
    path: '/sheets',
    name: 'sheets',
    component: () => import('@/views/SheetsView.vue'),
    meta: { title: 'Sheets' },
  },
  {
    path: '/sheets/:id',
    name: 'sheet',
    component: () => import('@/views/SheetView.vue'),
    props: true,
    meta: { title: 'Sheet' },
  },
  {
    path: '/sheets/:id/versions/:number/report',
    name: 'version-report',
    component: () => import('@/views/ReportView.vue'),
    props: true,
    meta: { title: 'Report' },
  },
  {
    path: '/invitations/:token',
    name: 'invitation',
    component: () => import('@/views/InvitationView.vue'),
    props: true,
    meta: { title: 'Invitation', public: true },
  },
  {
    path: '/account',
    name: 'account',
    component: () => import('@/views/AccountView.vue'),
    meta: { title: 'Account' },
  },
  {
    path: '/admin',
    name: 'admin',
    component: () => import('@/views/AdminView.vue'),
    meta: { title: 'Admin', requiresAdmin: true },
  },
  {
    path: '/admins-only',
    name: 'admins-only',
    component: () => import('@/views/AdminsOnlyView.vue'),
    meta: { title: 'Admins only' },
  },
  {
    path: '/mailbox',
    name: 'mailbox',
    component: () => import('@/views/MailboxView.vue'),
    // It shows live reset links: the site admin's page only.
    meta: { title: 'Mailbox', requiresAdmin: true },
  },
  {
    path: '/:pathMatch(.*)*',
    name: 'not-found',
    component: () => import('@/views/NotFoundView.vue'),
    meta: { title: 'Not found', public: true },
  },
];
