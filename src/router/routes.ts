import { defineComponent } from 'vue';
import type { RouteRecordRaw } from 'vue-router';

/** Never shown: the guard always sends `/` on to a real page. */
const Nothing = defineComponent({ name: 'RootRedirect', render: () => null });

/** Every page of the app. Views are loaded lazily, one chunk per page. */
export const routes: RouteRecordRaw[] = [
  // `/` sends each person to their role's home (decided in the guard, once the session is known).
  { path: '/', name: 'root', component: Nothing },

  {
    path: '/sign-in',
    name: 'sign-in',
    component: () => import('@/views/public/SignInView.vue'),
    meta: { public: true, guestOnly: true, title: 'Sign in' },
  },
  {
    path: '/forgot-password',
    name: 'forgot-password',
    component: () => import('@/views/public/ForgotPasswordView.vue'),
    meta: { public: true, title: 'Forgotten password' },
  },
  {
    path: '/reset-password',
    name: 'reset-password',
    component: () => import('@/views/public/ResetPasswordView.vue'),
    meta: { public: true, title: 'Choose a password' },
  },

  {
    path: '/admin',
    name: 'admin-home',
    component: () => import('@/views/home/AdminHomeView.vue'),
    meta: { roles: ['admin'], title: 'Administrator home' },
  },
  {
    path: '/admin/users',
    name: 'admin-users',
    component: () => import('@/views/admin/UsersView.vue'),
    meta: { roles: ['admin'], title: 'Users' },
  },
  {
    path: '/admin/mail',
    name: 'admin-mail',
    component: () => import('@/views/admin/MailView.vue'),
    meta: { roles: ['admin'], title: 'Mail sink' },
  },
  {
    path: '/employer',
    name: 'employer-home',
    component: () => import('@/views/home/EmployerHomeView.vue'),
    meta: { roles: ['employer'], title: 'Employer home' },
  },
  {
    path: '/operator',
    name: 'operator-home',
    component: () => import('@/views/home/OperatorHomeView.vue'),
    meta: { roles: ['operator'], title: 'Operator home' },
  },
  {
    path: '/operator/trials',
    name: 'operator-trials',
    component: () => import('@/views/operator/TrialsView.vue'),
    meta: { roles: ['operator'], title: 'Trials' },
  },
  {
    path: '/operator/trials/:trialId',
    name: 'operator-briefing',
    component: () => import('@/views/operator/TrialBriefingView.vue'),
    meta: { roles: ['operator'], title: 'Briefing' },
  },
  {
    path: '/operator/drives/:attemptId',
    name: 'operator-drive',
    // The console carries konva: it loads with this route only, never with the main bundle.
    component: () => import('@/views/operator/DriveConsoleView.vue'),
    meta: { roles: ['operator'], title: 'Drive console', wide: true },
  },
  {
    path: '/assessor',
    name: 'assessor-home',
    component: () => import('@/views/home/AssessorHomeView.vue'),
    meta: { roles: ['assessor'], title: 'Assessor home' },
  },
  {
    path: '/assessor/reviews',
    name: 'review-queue',
    component: () => import('@/views/assessor/ReviewQueueView.vue'),
    meta: { roles: ['assessor'], title: 'Review queue' },
  },
  {
    path: '/assessor/reviews/:attemptId',
    name: 'review-workspace',
    // The replay carries konva: loaded with this route only.
    component: () => import('@/views/assessor/ReviewWorkspaceView.vue'),
    meta: { roles: ['assessor'], title: 'Review', wide: true },
  },
  {
    path: '/attempts/:attemptId/report',
    name: 'attempt-report',
    // The report carries konva and chart.js: loaded with this route only.
    component: () => import('@/views/report/AttemptReportView.vue'),
    meta: { roles: ['operator', 'employer', 'assessor', 'admin'], title: 'Attempt report' },
  },
  {
    path: '/hr',
    name: 'hr-home',
    component: () => import('@/views/home/HrHomeView.vue'),
    meta: { roles: ['hr'], title: 'HR home' },
  },

  {
    path: '/:pathMatch(.*)*',
    name: 'not-found',
    component: () => import('@/views/NotFoundView.vue'),
    meta: { public: true, title: 'Page not found' },
  },
];
